// A socket lives only as long as the credential that opened it: the session row (signed out,
// expired, or deleted by anything — a password reset, an account deleted) or the API token
// (revoked). Checked for every open connection together, once per role-feed interval, by two
// indexed queries whatever the number of connections; so whatever ends a credential, its sockets
// close within about a second, with no hook in the code that ended it.
import { and, gt, inArray, isNull } from "drizzle-orm";
import type { Db } from "../db/client";
import { apiTokens, sessions } from "../db/schema";
import type { CollabIdentity } from "./connection";

/** What opened a socket; a visitor without a session row has none to follow. */
export type Credential = { sessionId: string } | { tokenId: string } | null;

/** The connections whose credential has ended, or whose session now belongs to someone else. */
export async function endedCredentials<M extends { identity: CollabIdentity }>(db: Db, connections: Iterable<M>): Promise<M[]> {
  const bySession = new Map<string, M[]>();
  const byToken = new Map<string, M[]>();
  for (const connection of connections) {
    const { credential } = connection.identity;
    if (!credential) continue;
    const [index, key] = "sessionId" in credential ? [bySession, credential.sessionId] : [byToken, credential.tokenId];
    const list = index.get(key);
    if (list) list.push(connection);
    else index.set(key, [connection]);
  }
  const [liveSessions, liveTokens] = await Promise.all([
    bySession.size === 0
      ? []
      : db
          .select({ id: sessions.id, userId: sessions.userId })
          .from(sessions)
          .where(and(inArray(sessions.id, [...bySession.keys()]), gt(sessions.expiresAt, new Date()))),
    byToken.size === 0
      ? []
      : db
          .select({ id: apiTokens.id })
          .from(apiTokens)
          .where(and(inArray(apiTokens.id, [...byToken.keys()]), isNull(apiTokens.revokedAt))),
  ]);
  const sessionUser = new Map(liveSessions.map((row) => [row.id, row.userId]));
  const ended: M[] = [];
  for (const [id, list] of bySession) {
    for (const connection of list) if (!sessionUser.has(id) || sessionUser.get(id) !== connection.identity.userId) ended.push(connection);
  }
  const tokens = new Set(liveTokens.map((row) => row.id));
  for (const [id, list] of byToken) if (!tokens.has(id)) ended.push(...list);
  return ended;
}
