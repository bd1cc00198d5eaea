// Read-only links to one mechanism, for a class or a reviewer without an account.
import { and, desc, eq, isNull } from "drizzle-orm";
import { newSecret } from "../auth/secrets";
import type { Db } from "./client";
import { MembershipError } from "./mechanisms";
import { roleChanges, viewLinks } from "./schema";

export async function createViewLink(db: Db, actorId: string, mechanismId: string, input: { expiresAt?: Date; label?: string }) {
  const secret = newSecret("view");
  const [row] = await db
    .insert(viewLinks)
    .values({ mechanismId, tokenHash: secret.hash, hint: secret.hint, label: input.label ?? "", createdBy: actorId, expiresAt: input.expiresAt })
    .returning();
  await db.insert(roleChanges).values({ mechanismId, actorId, subjectEmail: `view link …${secret.hint}`, action: "link", toRole: "viewer" });
  return { link: row, token: secret.token };
}

export async function listViewLinks(db: Db, mechanismId: string) {
  const rows = await db.select().from(viewLinks).where(eq(viewLinks.mechanismId, mechanismId)).orderBy(desc(viewLinks.createdAt));
  const now = new Date();
  return rows.map((r) => ({
    id: r.id,
    hint: r.hint,
    label: r.label,
    createdAt: r.createdAt,
    expiresAt: r.expiresAt,
    status: r.revokedAt ? ("revoked" as const) : r.expiresAt && r.expiresAt < now ? ("expired" as const) : ("live" as const),
  }));
}

export async function revokeViewLink(db: Db, actorId: string, mechanismId: string, linkId: string) {
  const [row] = await db
    .update(viewLinks)
    .set({ revokedAt: new Date() })
    .where(and(eq(viewLinks.id, linkId), eq(viewLinks.mechanismId, mechanismId), isNull(viewLinks.revokedAt)))
    .returning();
  if (!row) throw new MembershipError("That view link does not exist or was already revoked.");
  await db.insert(roleChanges).values({ mechanismId, actorId, subjectEmail: `view link …${row.hint}`, action: "unlink", fromRole: "viewer" });
}
