// Mechanisms, their members and the audit trail of role changes. Pure data access: the caller
// has already checked that the actor may do this.
import { randomBytes } from "node:crypto";
import { and, desc, eq, sql } from "drizzle-orm";
import type { Db } from "./client";
import type { Role } from "../../app/shared/roles";
import { mechanisms, memberships, roleChanges, users } from "./schema";

export type MemberRole = Exclude<Role, "owner">;

/** Short, unguessable, URL-safe ids (no ambiguous letters). */
export function newMechanismId(): string {
  const alphabet = "abcdefghjkmnpqrstuvwxyz23456789";
  return Array.from(randomBytes(12), (b) => alphabet[b % alphabet.length]).join("");
}

export async function roleOf(db: Db, mechanismId: string, userId: string): Promise<Role | null> {
  const rows = await db
    .select({ ownerId: mechanisms.ownerId, role: memberships.role })
    .from(mechanisms)
    .leftJoin(memberships, and(eq(memberships.mechanismId, mechanisms.id), eq(memberships.userId, userId)))
    .where(eq(mechanisms.id, mechanismId));
  if (rows.length === 0) return null;
  if (rows[0].ownerId === userId) return "owner";
  return rows[0].role ?? null;
}

export interface MechanismListing {
  id: string;
  title: string;
  role: Role;
  owner: string;
  updatedAt: Date;
}

export async function listMechanismsFor(db: Db, userId: string): Promise<MechanismListing[]> {
  const rows = await db
    .select({
      id: mechanisms.id,
      title: mechanisms.title,
      ownerId: mechanisms.ownerId,
      owner: users.name,
      memberRole: memberships.role,
      updatedAt: mechanisms.updatedAt,
    })
    .from(mechanisms)
    .innerJoin(users, eq(users.id, mechanisms.ownerId))
    .leftJoin(memberships, and(eq(memberships.mechanismId, mechanisms.id), eq(memberships.userId, userId)))
    .where(sql`${mechanisms.ownerId} = ${userId} or ${memberships.userId} is not null`)
    .orderBy(desc(mechanisms.updatedAt));
  return rows.map((r) => ({
    id: r.id,
    title: r.title,
    role: r.ownerId === userId ? "owner" : (r.memberRole as Role),
    owner: r.owner,
    updatedAt: r.updatedAt,
  }));
}

export async function createMechanism(db: Db, ownerId: string, input: { title: string; source?: string; summary?: string }) {
  const [row] = await db
    .insert(mechanisms)
    .values({ id: newMechanismId(), ownerId, title: input.title, source: input.source ?? "", summary: input.summary ?? "" })
    .returning();
  return row;
}

export async function findMechanism(db: Db, id: string) {
  return db.query.mechanisms.findFirst({ where: eq(mechanisms.id, id) });
}

export async function renameMechanism(db: Db, id: string, title: string) {
  await db.update(mechanisms).set({ title, updatedAt: new Date() }).where(eq(mechanisms.id, id));
}

export async function saveSource(db: Db, id: string, source: string) {
  await db.update(mechanisms).set({ source, updatedAt: new Date() }).where(eq(mechanisms.id, id));
}

export async function deleteMechanism(db: Db, actorId: string, id: string) {
  await db.transaction(async (tx) => {
    const actor = await tx.query.users.findFirst({ where: eq(users.id, actorId) });
    await tx.insert(roleChanges).values({ mechanismId: id, actorId, subjectId: actorId, subjectEmail: actor?.email ?? "", action: "delete", fromRole: "owner" });
    await tx.delete(mechanisms).where(eq(mechanisms.id, id));
  });
}

export interface Member {
  userId: string;
  name: string;
  email: string;
  role: Role;
}

export async function listMembers(db: Db, mechanismId: string): Promise<Member[]> {
  const mechanism = await findMechanism(db, mechanismId);
  if (!mechanism) return [];
  const owner = await db.query.users.findFirst({ where: eq(users.id, mechanism.ownerId) });
  const rows = await db
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.mechanismId, mechanismId))
    .orderBy(memberships.role, users.name);
  return [{ userId: owner!.id, name: owner!.name, email: owner!.email, role: "owner" }, ...rows];
}

/** A member change the owner should read about, not a server fault. */
export class MembershipError extends Error {
  override name = "MembershipError";
}

export function isMembershipError(error: unknown): error is MembershipError {
  return error instanceof MembershipError;
}

export async function addMember(db: Db, actorId: string, mechanismId: string, email: string, role: MemberRole) {
  const user = await db.query.users.findFirst({ where: eq(users.email, email.trim().toLowerCase()) });
  if (!user) throw new MembershipError(`No account uses ${email}. Ask them to sign up first.`);
  // Anyone can sign up with any address; only its confirmed owner may be handed a seat by it.
  if (!user.emailVerifiedAt) {
    throw new MembershipError(`The account for ${user.email} has not confirmed its e-mail address yet. Send an invitation instead: it is granted once the address is confirmed.`);
  }
  const current = await roleOf(db, mechanismId, user.id);
  if (current === "owner") throw new MembershipError("That person owns this mechanism already.");
  if (current) throw new MembershipError(`${user.name} is already a member (${current}). Change the role in the table instead.`);
  await db.transaction(async (tx) => {
    await tx.insert(memberships).values({ mechanismId, userId: user.id, role });
    await tx.insert(roleChanges).values({ mechanismId, actorId, subjectId: user.id, subjectEmail: user.email, action: "grant", toRole: role });
  });
  return user;
}

async function memberOrFail(db: Db, mechanismId: string, userId: string) {
  const row = await db
    .select({ role: memberships.role, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.mechanismId, mechanismId), eq(memberships.userId, userId)));
  if (row.length === 0) throw new MembershipError("That person is not a member of this mechanism.");
  return row[0];
}

export async function changeRole(db: Db, actorId: string, mechanismId: string, userId: string, role: MemberRole) {
  const member = await memberOrFail(db, mechanismId, userId);
  if (member.role === role) return;
  await db.transaction(async (tx) => {
    await tx.update(memberships).set({ role }).where(and(eq(memberships.mechanismId, mechanismId), eq(memberships.userId, userId)));
    await tx.insert(roleChanges).values({ mechanismId, actorId, subjectId: userId, subjectEmail: member.email, action: "change", fromRole: member.role, toRole: role });
  });
}

export async function removeMember(db: Db, actorId: string, mechanismId: string, userId: string) {
  const member = await memberOrFail(db, mechanismId, userId);
  await db.transaction(async (tx) => {
    await tx.delete(memberships).where(and(eq(memberships.mechanismId, mechanismId), eq(memberships.userId, userId)));
    await tx.insert(roleChanges).values({ mechanismId, actorId, subjectId: userId, subjectEmail: member.email, action: "revoke", fromRole: member.role });
  });
}

/** The new owner must already be a member; the old owner stays on as an editor. */
export async function transferOwnership(db: Db, actorId: string, mechanismId: string, newOwnerId: string) {
  const member = await memberOrFail(db, mechanismId, newOwnerId);
  await db.transaction(async (tx) => {
    await tx.delete(memberships).where(and(eq(memberships.mechanismId, mechanismId), eq(memberships.userId, newOwnerId)));
    await tx.insert(memberships).values({ mechanismId, userId: actorId, role: "editor" });
    await tx.update(mechanisms).set({ ownerId: newOwnerId, updatedAt: new Date() }).where(eq(mechanisms.id, mechanismId));
    await tx.insert(roleChanges).values({ mechanismId, actorId, subjectId: newOwnerId, subjectEmail: member.email, action: "transfer", fromRole: member.role, toRole: "owner" });
  });
}

export async function roleHistory(db: Db, mechanismId: string) {
  return db
    .select({ at: roleChanges.at, action: roleChanges.action, subjectEmail: roleChanges.subjectEmail, fromRole: roleChanges.fromRole, toRole: roleChanges.toRole, actor: users.name })
    .from(roleChanges)
    .leftJoin(users, eq(users.id, roleChanges.actorId))
    .where(eq(roleChanges.mechanismId, mechanismId))
    .orderBy(desc(roleChanges.at))
    .limit(50);
}
