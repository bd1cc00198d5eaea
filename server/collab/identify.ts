// Who opens a collaboration socket, decided exactly as for routes (server/auth/caller.ts):
// the session cookie, a personal access token, or a view link remembered in the session.
import type { IncomingMessage } from "node:http";
import type { SessionStore } from "../auth/sessions";
import { accessTo, identifyCaller as callerFrom } from "../auth/caller";
import type { Db } from "../db/client";
import { UpgradeRefusal, type Identify } from "./endpoint";

export function identifyCaller(db: Db, sessions: SessionStore): Identify {
  return async (request: IncomingMessage, mechanismId: string) => {
    const caller = await callerFrom(db, sessions, { cookie: request.headers.cookie, authorization: request.headers.authorization });
    if (caller === "bad-token") throw new UpgradeRefusal(401, "That access token is not valid.");
    if (!caller.user && caller.viewTokens.length === 0) throw new UpgradeRefusal(401, "Sign in first.");
    const role = await accessTo(db, caller, mechanismId, true);
    if (!role) return null;
    return {
      userId: caller.user?.id ?? null,
      name: caller.user?.name ?? "Guest with a view link",
      role,
      recheck: () => accessTo(db, caller, mechanismId, true),
      credential: caller.tokenId ? { tokenId: caller.tokenId } : caller.sessionId ? { sessionId: caller.sessionId } : null,
    };
  };
}
