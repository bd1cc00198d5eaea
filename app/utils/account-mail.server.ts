// The account's own mail: the link that confirms its address and the password-reset link.
import { eq } from "drizzle-orm";
import type { AppLoadContext } from "react-router";
import type { AuthUser } from "../../server/auth/authenticator";
import { issueEmailToken, sentRecently } from "../../server/auth/email-tokens";
import { waitingSeats } from "../../server/db/invitations";
import { users } from "../../server/db/schema";
import { passwordResetMessage, verificationMessage } from "../../server/mail/messages";
import { publicOrigin } from "./links.server";

/** Mails a fresh confirmation link (older ones stop working); mail trouble is logged, not fatal. */
export async function sendVerification(context: AppLoadContext, request: Request, user: AuthUser) {
  const { token, expiresAt } = await issueEmailToken(context.db, user, "verify");
  const waiting = (await waitingSeats(context.db, user.id)).map((s) => s.title);
  const url = `${publicOrigin(context, request)}/verify-email/${token}`;
  try {
    await context.mailer.send(verificationMessage({ to: user.email, name: user.name, url, expiresAt, waiting }));
  } catch (error) {
    console.error(`[mail] verification link to ${user.email} failed: ${(error as Error).message}`);
  }
}

/**
 * Mails a reset link if an account uses `email`, in the background: the caller answers at once
 * and in the same words either way, so neither the answer nor its timing tells who has an account.
 */
export function requestPasswordReset(context: AppLoadContext, request: Request, email: string): void {
  const origin = publicOrigin(context, request);
  const send = async () => {
    const user = await context.db.query.users.findFirst({ where: eq(users.email, email) });
    if (!user || (await sentRecently(context.db, user.id, "reset"))) return;
    const { token, expiresAt } = await issueEmailToken(context.db, user, "reset");
    await context.mailer.send(passwordResetMessage({ to: user.email, name: user.name, url: `${origin}/reset-password/${token}`, expiresAt }));
  };
  send().catch((error: Error) => console.error(`[mail] password reset for ${email} failed: ${error.message}`));
}
