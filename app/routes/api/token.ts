import { revokeApiToken } from "../../../server/db/api-tokens";
import { requireUser } from "~/utils/auth.server";
import { httpError } from "~/utils/http";
import type { Route } from "./+types/token";

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "DELETE") return httpError(405, "Use DELETE to revoke a token.");
  const user = await requireUser(args);
  if (!(await revokeApiToken(args.context.db, user.id, args.params.id))) return httpError(404, "No live token with that id.");
  return new Response(null, { status: 204 });
}
