// Sharing actions used by both the Members page and the JSON API, so they behave the same.
import { eq } from "drizzle-orm";
import type { AppLoadContext } from "react-router";
import type { AuthUser } from "../../server/auth/authenticator";
import { liveViewLink } from "../../server/auth/caller";
import { hashSecret } from "../../server/auth/secrets";
import { createInvitation } from "../../server/db/invitations";
import type { MemberRole } from "../../server/db/mechanisms";
import { viewLinks } from "../../server/db/schema";
import { createViewLink } from "../../server/db/view-links";
import { invitationMessage, roleChangedMessage } from "../../server/mail/messages";
import { publicOrigin } from "./links.server";

export async function inviteByEmail(
  context: AppLoadContext,
  request: Request,
  actor: AuthUser,
  mechanism: { id: string; title: string },
  email: string,
  role: MemberRole,
) {
  const { invitation, token } = await createInvitation(context.db, actor.id, mechanism.id, email, role);
  await context.mailer.send(
    invitationMessage({ to: invitation.email, inviter: actor.name, title: mechanism.title, role, url: `${publicOrigin(context, request)}/invite/${token}`, expiresAt: invitation.expiresAt }),
  );
  return invitation;
}

export async function makeViewLink(context: AppLoadContext, request: Request, actor: AuthUser, mechanismId: string, input: { expiresAt?: Date; label?: string }) {
  const { link, token } = await createViewLink(context.db, actor.id, mechanismId, input);
  return { id: link.id, url: `${publicOrigin(context, request)}/v/${token}`, expiresAt: link.expiresAt };
}

/** The mechanism a view-link token opens, or null when the link is unknown, expired or revoked. */
export async function viewLinkMechanism(context: AppLoadContext, token: string): Promise<string | null> {
  const [link] = await context.db.select({ mechanismId: viewLinks.mechanismId }).from(viewLinks).where(eq(viewLinks.tokenHash, hashSecret(token)));
  return link && (await liveViewLink(context.db, link.mechanismId, [token])) ? link.mechanismId : null;
}

/** Tells a member their role changed (or that they were removed); mail trouble never undoes it. */
export async function notifyRoleChange(
  context: AppLoadContext,
  request: Request,
  input: { to: string; actor: string; mechanism: { id: string; title: string }; role: string | null },
) {
  try {
    await context.mailer.send(roleChangedMessage({ to: input.to, actor: input.actor, title: input.mechanism.title, role: input.role, url: `${publicOrigin(context, request)}/m/${input.mechanism.id}` }));
  } catch (error) {
    console.error(`[mail] role-change notice to ${input.to} failed: ${(error as Error).message}`);
  }
}
