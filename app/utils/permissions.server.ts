// The one role check every loader, action and API call goes through.
import type { AuthUser } from "../../server/auth/authenticator";
import { accessTo } from "../../server/auth/caller";
import { findMechanism } from "../../server/db/mechanisms";
import { atLeast, type Role } from "~/shared/roles";
import { getCaller, signInRequired, type RequestArgs } from "./auth.server";
import { mechanismIdField } from "~/shared/fields";
import { httpError } from "./http";

type Mechanism = NonNullable<Awaited<ReturnType<typeof findMechanism>>>;

interface Access {
  /** Null only for a signed-out visitor holding a view link (requireViewAccess). */
  user: AuthUser | null;
  role: Role;
  mechanism: Mechanism;
}

/**
 * The caller's access to a mechanism. Strangers get 404 (its existence is not revealed),
 * members whose role is too low 403, signed-out callers without a view link a sign-in.
 */
export async function requireRole(args: RequestArgs, mechanismId: string | undefined, needed: "editor" | "owner"): Promise<Access & { user: AuthUser }>;
export async function requireRole(args: RequestArgs, mechanismId: string | undefined, needed: "viewer"): Promise<Access & { user: AuthUser }>;
export async function requireRole(args: RequestArgs, mechanismId: string | undefined, needed: Role): Promise<Access> {
  return checkAccess(args, mechanismId, needed, false);
}

/** Viewer access that a live view link also grants: the mechanism page, projector and room. */
export function requireViewAccess(args: RequestArgs, mechanismId: string | undefined): Promise<Access> {
  return checkAccess(args, mechanismId, "viewer", true);
}

async function checkAccess(args: RequestArgs, mechanismId: string | undefined, needed: Role, allowViewLink: boolean): Promise<Access> {
  const caller = await getCaller(args);
  // A malformed id (a NUL, say) names no mechanism; PostgreSQL would refuse it with an error.
  const role = mechanismId && mechanismIdField.safeParse(mechanismId).success ? await accessTo(args.context.db, caller, mechanismId, allowViewLink) : null;
  if (!mechanismId || !role) {
    if (!caller.user) throw signInRequired(args.request);
    throw httpError("not_found", "No mechanism with that id is visible to you.");
  }
  if (!atLeast(role, needed)) throw httpError("forbidden", `This needs the ${needed} role; you are a ${role}.`);
  const mechanism = await findMechanism(args.context.db, mechanismId);
  if (!mechanism) throw httpError("not_found", "No mechanism with that id is visible to you.");
  return { user: caller.user, role, mechanism };
}
