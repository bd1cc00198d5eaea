// Personal access tokens: each acts with its owner's roles; shown once, stored hashed.
import { and, desc, eq, isNull } from "drizzle-orm";
import { newSecret } from "../auth/secrets";
import type { Db } from "./client";
import { apiTokens } from "./schema";

export async function createApiToken(db: Db, userId: string, name: string) {
  const secret = newSecret("mwt");
  const [row] = await db.insert(apiTokens).values({ userId, name, tokenHash: secret.hash, hint: secret.hint }).returning();
  return { id: row.id, name: row.name, token: secret.token, createdAt: row.createdAt };
}

export async function listApiTokens(db: Db, userId: string) {
  return db
    .select({ id: apiTokens.id, name: apiTokens.name, hint: apiTokens.hint, createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt })
    .from(apiTokens)
    .where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
    .orderBy(desc(apiTokens.createdAt));
}

/** True when a live token of this user was revoked. */
export async function revokeApiToken(db: Db, userId: string, tokenId: string): Promise<boolean> {
  const rows = await db
    .update(apiTokens)
    .set({ revokedAt: new Date() })
    .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
    .returning({ id: apiTokens.id });
  return rows.length > 0;
}
