import { revokeApiToken } from "~/utils/accounts.server";
import { requireUser } from "~/utils/auth.server";
import { z } from "zod";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import type { Route } from "./+types/token";

const allowed = ["DELETE"];
const hint = "Use DELETE to revoke a token.";
export const loader = onlyMethods(allowed, hint);
const uuid = z.guid();

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "DELETE") return methodNotAllowed(allowed, hint);
  const user = await requireUser(args);
  if (!uuid.safeParse(args.params.id).success) return httpError("bad_input", "That is not a token id: token ids are UUIDs, as GET /api/v1/tokens lists them.");
  if (!(await revokeApiToken(args.context.db, user.id, args.params.id))) return httpError("not_found", "No live token with that id.");
  return new Response(null, { status: 204 });
}
