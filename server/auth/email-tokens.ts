// Links mailed to an account's own address: "confirm this address" and "choose a new password".
// Like every bearer secret here only a hash is stored; each link works once, until it expires,
// and issuing a new one retires the older ones of the same kind.
import { and, desc, eq, isNull } from "drizzle-orm";
import type { Db } from "../db/client";
import { grantWaitingSeats } from "../db/invitations";
import { apiTokens, emailTokens, failedSignIns, sessions, users } from "../db/schema";
import { toAuthUser, type AuthUser } from "./authenticator";
import { hashPassword } from "./password";
import { hashSecret, newSecret } from "./secrets";

export type EmailTokenPurpose = (typeof emailTokens.$inferSelect)["purpose"];

export const TOKEN_HOURS: Record<EmailTokenPurpose, number> = { verify: 24, reset: 1 };
/** Links of one kind to one account are sent at most this often (a resend button, a reset form). */
export const RESEND_INTERVAL_MS = 60_000;

export async function issueEmailToken(db: Db, user: { id: string; email: string }, purpose: EmailTokenPurpose) {
  const secret = newSecret(purpose === "verify" ? "ver" : "rst");
  const expiresAt = new Date(Date.now() + TOKEN_HOURS[purpose] * 3600_000);
  await db.transaction(async (tx) => {
    await tx
      .update(emailTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(emailTokens.userId, user.id), eq(emailTokens.purpose, purpose), isNull(emailTokens.usedAt)));
    await tx.insert(emailTokens).values({ userId: user.id, purpose, tokenHash: secret.hash, email: user.email, expiresAt });
  });
  return { token: secret.token, expiresAt };
}

/** True when a link of this kind went to the account less than RESEND_INTERVAL_MS ago. */
export async function sentRecently(db: Db, userId: string, purpose: EmailTokenPurpose): Promise<boolean> {
  const [last] = await db
    .select({ at: emailTokens.createdAt })
    .from(emailTokens)
    .where(and(eq(emailTokens.userId, userId), eq(emailTokens.purpose, purpose)))
    .orderBy(desc(emailTokens.createdAt))
    .limit(1);
  return !!last && Date.now() - last.at.getTime() < RESEND_INTERVAL_MS;
}

export type EmailTokenLookup = { ok: true; tokenId: string; user: AuthUser } | { ok: false; reason: string };

/** What a mailed link opens, or why it opens nothing (unknown, used or replaced, expired). */
export async function lookUpEmailToken(db: Db, token: string, purpose: EmailTokenPurpose): Promise<EmailTokenLookup> {
  const [row] = await db
    .select({ token: emailTokens, user: users })
    .from(emailTokens)
    .innerJoin(users, eq(users.id, emailTokens.userId))
    .where(and(eq(emailTokens.tokenHash, hashSecret(token)), eq(emailTokens.purpose, purpose)));
  // A link sent to an address the account no longer uses proves nothing about the account.
  if (!row || row.token.email !== row.user.email) return { ok: false, reason: "This link is not valid." };
  if (row.token.usedAt) return { ok: false, reason: "This link was already used, or a newer one replaced it." };
  if (row.token.expiresAt < new Date()) return { ok: false, reason: "This link has expired. Ask for a new one." };
  return { ok: true, tokenId: row.token.id, user: toAuthUser(row.user) };
}

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/**
 * Uses a link once (the first of two concurrent clicks wins), marks the address verified — a
 * reset link proves the same control of the mailbox — and grants the seats that waited for it.
 * Returns the account and the mechanisms it joined, or the reason the link opens nothing.
 */
async function redeem(db: Db, token: string, purpose: EmailTokenPurpose, also?: (tx: Tx, user: AuthUser) => Promise<void>) {
  const found = await lookUpEmailToken(db, token, purpose);
  if (!found.ok) return found;
  return db.transaction(async (tx) => {
    const claimed = await tx
      .update(emailTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(emailTokens.id, found.tokenId), isNull(emailTokens.usedAt)))
      .returning({ id: emailTokens.id });
    if (claimed.length === 0) return { ok: false as const, reason: "This link was already used, or a newer one replaced it." };
    await tx.update(users).set({ emailVerifiedAt: new Date() }).where(and(eq(users.id, found.user.id), isNull(users.emailVerifiedAt)));
    await also?.(tx, found.user);
    const joined = await grantWaitingSeats(tx as unknown as Db, found.user);
    return { ok: true as const, user: { ...found.user, verified: true }, joined };
  });
}

export function verifyAddress(db: Db, token: string) {
  return redeem(db, token, "verify");
}

/**
 * Sets the new password, ends every session, revokes every access token (one an intruder minted
 * must not outlive the reset that locks them out) and clears the account's failed sign-ins.
 */
export async function resetPassword(db: Db, token: string, password: string) {
  // Look before hashing: a dead link should not cost an Argon2 run.
  const found = await lookUpEmailToken(db, token, "reset");
  if (!found.ok) return found;
  const passwordHash = await hashPassword(password);
  return redeem(db, token, "reset", async (tx, user) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, user.id));
    await tx.delete(sessions).where(eq(sessions.userId, user.id));
    await tx.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.userId, user.id), isNull(apiTokens.revokedAt)));
    await tx.delete(failedSignIns).where(eq(failedSignIns.email, user.email));
  });
}
