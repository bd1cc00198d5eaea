import { isMembershipError, revokeViewLink } from "~/utils/mechanisms.server";
import { z } from "zod";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/view-link";

const allowed = ["DELETE"];
const hint = "Use DELETE to revoke a view link.";
export const loader = onlyMethods(allowed, hint);
const uuid = z.guid();

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "DELETE") return methodNotAllowed(allowed, hint);
  const { mechanism, user } = await requireRole(args, args.params.id, "owner");
  if (!uuid.safeParse(args.params.linkId).success) return httpError("bad_input", "That is not a view link id: view link ids are UUIDs, as GET …/view-links lists them.");
  try {
    await revokeViewLink(args.context.db, user.id, mechanism.id, args.params.linkId);
  } catch (error) {
    if (isMembershipError(error)) return httpError("not_found", error.message);
    throw error;
  }
  return new Response(null, { status: 204 });
}
