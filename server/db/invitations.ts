// E-mail invitations: a single-use, expiring link that grants a role when accepted.
import { and, desc, eq, isNull } from "drizzle-orm";
import { hashSecret, newSecret } from "../auth/secrets";
import type { Db } from "./client";
import { MembershipError, roleOf, type MemberRole } from "./mechanisms";
import { invitations, mechanisms, memberships, roleChanges, users } from "./schema";

export const INVITATION_DAYS = 7;

/** Creates an invitation (replacing a pending one to the same address) and returns its token. */
export async function createInvitation(db: Db, actorId: string, mechanismId: string, email: string, role: MemberRole) {
  const address = email.trim().toLowerCase();
  const existing = await db.query.users.findFirst({ where: eq(users.email, address) });
  if (existing && (await roleOf(db, mechanismId, existing.id))) {
    throw new MembershipError(`${existing.name} is already a member. Change the role in the table instead.`);
  }
  const secret = newSecret("inv");
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86400_000);
  const invitation = await db.transaction(async (tx) => {
    await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.mechanismId, mechanismId), eq(invitations.email, address), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    const [row] = await tx.insert(invitations).values({ mechanismId, email: address, role, tokenHash: secret.hash, invitedBy: actorId, expiresAt }).returning();
    await tx.insert(roleChanges).values({ mechanismId, actorId, subjectEmail: address, action: "invite", toRole: role });
    return row;
  });
  return { invitation, token: secret.token };
}

export async function pendingInvitations(db: Db, mechanismId: string) {
  const rows = await db
    .select()
    .from(invitations)
    .where(and(eq(invitations.mechanismId, mechanismId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
    .orderBy(desc(invitations.createdAt));
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role,
    createdAt: r.createdAt,
    expiresAt: r.expiresAt,
    // A claimed invitation was accepted in time; it waits only for the address to be verified.
    expired: !r.claimedBy && r.expiresAt < new Date(),
    waitingForVerification: r.claimedBy !== null,
  }));
}

export async function findPendingInvitation(db: Db, mechanismId: string, invitationId: string) {
  const [row] = await db
    .select()
    .from(invitations)
    .where(and(eq(invitations.id, invitationId), eq(invitations.mechanismId, mechanismId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
  return row;
}

export async function revokeInvitation(db: Db, actorId: string, mechanismId: string, invitationId: string) {
  const row = await findPendingInvitation(db, mechanismId, invitationId);
  if (!row) throw new MembershipError("That invitation is no longer pending.");
  await db.transaction(async (tx) => {
    await tx.update(invitations).set({ revokedAt: new Date() }).where(eq(invitations.id, invitationId));
    await tx.insert(roleChanges).values({ mechanismId, actorId, subjectEmail: row.email, action: "uninvite", fromRole: row.role });
  });
}

export type InvitationLookup =
  | { ok: true; invitation: typeof invitations.$inferSelect; title: string; inviter: string }
  | { ok: false; reason: string };

/** What a token opens, or why it opens nothing (used, revoked, expired, unknown). */
export async function lookUpInvitation(db: Db, token: string): Promise<InvitationLookup> {
  const [row] = await db
    .select({ invitation: invitations, title: mechanisms.title, inviter: users.name })
    .from(invitations)
    .innerJoin(mechanisms, eq(mechanisms.id, invitations.mechanismId))
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(eq(invitations.tokenHash, hashSecret(token)));
  if (!row) return { ok: false, reason: "This invitation link is not valid." };
  if (row.invitation.acceptedAt) return { ok: false, reason: "This invitation was already used." };
  if (row.invitation.revokedAt) return { ok: false, reason: "This invitation was withdrawn by the owner." };
  if (row.invitation.expiresAt < new Date()) return { ok: false, reason: "This invitation has expired. Ask the owner for a new one." };
  return { ok: true, invitation: row.invitation, title: row.title, inviter: row.inviter ?? "The owner" };
}

/**
 * Accepts an invitation for `user`, whose address must be the invited one. A verified account
 * takes the role at once; an unverified one claims the invitation, which waits for the address
 * to be verified (grantWaitingSeats) — a seat granted by address needs proof of the address.
 */
export async function acceptInvitation(db: Db, token: string, user: { id: string; email: string; verified: boolean }) {
  const found = await lookUpInvitation(db, token);
  if (!found.ok) throw new MembershipError(found.reason);
  const { invitation } = found;
  if (invitation.email !== user.email) {
    throw new MembershipError(`This invitation is for ${invitation.email}; you are signed in as ${user.email}.`);
  }
  if (!user.verified) {
    await db.update(invitations).set({ claimedBy: user.id }).where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    return { mechanismId: invitation.mechanismId, waiting: true };
  }
  await db.transaction(async (tx) => {
    if (!(await grant(tx as unknown as Db, invitation, user))) throw new MembershipError("This invitation was already used.");
  });
  return { mechanismId: invitation.mechanismId, waiting: false };
}

/** Grants, once its address is verified, every invitation the account claimed while it was not. */
export async function grantWaitingSeats(db: Db, user: { id: string; email: string }): Promise<string[]> {
  const claimed = await db
    .select()
    .from(invitations)
    .where(and(eq(invitations.claimedBy, user.id), eq(invitations.email, user.email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
  const joined = [];
  for (const invitation of claimed) if (await grant(db, invitation, user)) joined.push(invitation.mechanismId);
  return joined;
}

/** Marks the invitation accepted and gives the role; false when someone else got there first. */
async function grant(db: Db, invitation: typeof invitations.$inferSelect, user: { id: string; email: string }): Promise<boolean> {
  // Single use even under a double click: only the first update finds the row still pending.
  const claimed = await db
    .update(invitations)
    .set({ acceptedAt: new Date(), acceptedBy: user.id })
    .where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
    .returning({ id: invitations.id });
  if (claimed.length === 0) return false;
  const current = await roleOf(db, invitation.mechanismId, user.id);
  if (!current) await db.insert(memberships).values({ mechanismId: invitation.mechanismId, userId: user.id, role: invitation.role });
  await db.insert(roleChanges).values({
    mechanismId: invitation.mechanismId,
    actorId: invitation.invitedBy,
    subjectId: user.id,
    subjectEmail: user.email,
    action: "accept",
    toRole: current ?? invitation.role,
  });
  return true;
}

/** The seats an unverified account has claimed, for telling it what waits for verification. */
export async function waitingSeats(db: Db, userId: string) {
  return db
    .select({ mechanismId: invitations.mechanismId, title: mechanisms.title, role: invitations.role })
    .from(invitations)
    .innerJoin(mechanisms, eq(mechanisms.id, invitations.mechanismId))
    .where(and(eq(invitations.claimedBy, userId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
}
