// Who is calling, from any of the ways Mechweave accepts: the session cookie, a personal access
// token (Authorization: Bearer), and view-link tokens remembered in the (possibly signed-out)
// session. Shared by routes and the collaboration WebSocket so both decide the same way.
import { and, eq, gt, inArray, isNull, or } from "drizzle-orm";
import { toAuthUser, type AuthUser } from "./authenticator";
import type { SessionStore } from "./sessions";
import { hashSecret } from "./secrets";
import type { Db } from "../db/client";
import { roleOf } from "../db/mechanisms";
import type { Role } from "../../app/shared/roles";
import { apiTokens, users, viewLinks } from "../db/schema";

export interface Caller {
  user: AuthUser | null;
  via: "session" | "token" | "none";
  /** Id of the personal access token used, for rate limits. */
  tokenId: string | null;
  /** Id of the session row the cookie names, so a live socket can follow it ending. */
  sessionId: string | null;
  viewTokens: string[];
}

export const nobody: Caller = { user: null, via: "none", tokenId: null, sessionId: null, viewTokens: [] };

export async function identifyCaller(db: Db, sessions: SessionStore, headers: { cookie?: string | null; authorization?: string | null }): Promise<Caller | "bad-token"> {
  const bearer = headers.authorization?.match(/^Bearer\s+(\S+)$/i)?.[1];
  if (bearer) {
    const [row] = await db
      .select({ tokenId: apiTokens.id, user: users })
      .from(apiTokens)
      .innerJoin(users, eq(users.id, apiTokens.userId))
      .where(and(eq(apiTokens.tokenHash, hashSecret(bearer)), isNull(apiTokens.revokedAt)));
    if (!row) return "bad-token";
    await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.tokenId));
    return { user: toAuthUser(row.user), via: "token", tokenId: row.tokenId, sessionId: null, viewTokens: [] };
  }
  const session = await sessions.getSession(headers.cookie ?? null);
  const viewTokens = session.get("viewTokens") ?? [];
  const userId = session.get("userId");
  const user = userId ? await db.query.users.findFirst({ where: eq(users.id, userId) }) : undefined;
  return {
    user: user ? toAuthUser(user) : null,
    via: user ? "session" : "none",
    tokenId: null,
    sessionId: session.id || null,
    viewTokens,
  };
}

/** The live view link among `tokens` that opens `mechanismId`, if any. */
export async function liveViewLink(db: Db, mechanismId: string, tokens: string[]) {
  if (tokens.length === 0) return undefined;
  const [row] = await db
    .select({ id: viewLinks.id })
    .from(viewLinks)
    .where(
      and(
        eq(viewLinks.mechanismId, mechanismId),
        inArray(viewLinks.tokenHash, tokens.map(hashSecret)),
        isNull(viewLinks.revokedAt),
        or(isNull(viewLinks.expiresAt), gt(viewLinks.expiresAt, new Date())),
      ),
    );
  return row;
}

/**
 * The caller's role on a mechanism: membership first, then — only where a view link reaches
 * (the live mechanism page, its projector view and its room) — a live view link as viewer.
 */
export async function accessTo(db: Db, caller: Caller, mechanismId: string, allowViewLink: boolean): Promise<Role | null> {
  const role = caller.user ? await roleOf(db, mechanismId, caller.user.id) : null;
  if (role || !allowViewLink) return role;
  return (await liveViewLink(db, mechanismId, caller.viewTokens)) ? "viewer" : null;
}
