// The one role check every loader, action and API call goes through.
import type { AuthUser } from "../../server/auth/authenticator";
import { findMechanism, roleOf } from "../../server/db/mechanisms";
import { atLeast, type Role } from "../../server/db/roles";
import { requireUser, type RequestArgs } from "./auth.server";

export function httpError(status: number, message: string): Response {
  return Response.json({ error: message }, { status });
}

/**
 * The caller's access to a mechanism. Strangers get 404 (the mechanism's existence is not
 * revealed); members whose role is too low get 403.
 */
export async function requireRole(args: RequestArgs, mechanismId: string | undefined, needed: Role) {
  const user: AuthUser = await requireUser(args);
  const role = mechanismId ? await roleOf(args.context.db, mechanismId, user.id) : null;
  if (!mechanismId || !role) throw httpError(404, "No mechanism with that id is visible to you.");
  if (!atLeast(role, needed)) throw httpError(403, `This needs the ${needed} role; you are a ${role}.`);
  const mechanism = (await findMechanism(args.context.db, mechanismId))!;
  return { user, role, mechanism };
}
