import { isMembershipError } from "../../../server/db/mechanisms";
import { revokeViewLink } from "../../../server/db/view-links";
import { httpError } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/view-link";

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "DELETE") return httpError(405, "Use DELETE to revoke a view link.");
  const { mechanism, user } = await requireRole(args, args.params.id, "owner");
  try {
    await revokeViewLink(args.context.db, user.id, mechanism.id, args.params.linkId);
  } catch (error) {
    if (isMembershipError(error)) return httpError(404, error.message);
    throw error;
  }
  return new Response(null, { status: 204 });
}
