// Every dynamics job the Dynamics panel runs (time course, equilibrium, Lyapunov exponent, sweep,
// continuation) and the Structure panel's witness search, on the text the page is showing; streamed with progress when asked.
import { mechanismJobRequest } from "~/shared/job-schemas";
import { readJson } from "~/utils/json.server";
import { jobOwner, modelFromSource, respondWithJob } from "~/utils/dynamics.server";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { requireViewAccess } from "~/utils/permissions.server";
import type { Route } from "./+types/dynamics";

const allowed = ["POST"];
const hint = "Use POST.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const { user } = await requireViewAccess(args, args.params.id);
  const { source, overrides, ...job } = await readJson(args.request, mechanismJobRequest);
  return respondWithJob(args.request, args.context, jobOwner(args.context, user), { ...job, model: modelFromSource(source, overrides) });
}
