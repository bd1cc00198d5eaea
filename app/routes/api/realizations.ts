import { requireUser } from "~/utils/auth.server";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { realizeRequest } from "~/shared/job-schemas";
import { runRealization } from "~/utils/realization.server";
import type { Route } from "./+types/realizations";

const allowed = ["POST"];
const hint = "Use POST with { ode, shift?, multiply? }.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const user = await requireUser(args);
  const input = await readJson(args.request, realizeRequest);
  return runRealization(args.request, args.context, user, input);
}
