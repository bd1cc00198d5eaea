import { simulateSettings } from "~/shared/job-schemas";
import { readJson } from "~/utils/json.server";
import { jobOwner, modelFromSource, respondWithJob } from "~/utils/dynamics.server";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/simulations";

const allowed = ["POST"];
const hint = "Use POST with { until, samples }.";
export const loader = onlyMethods(allowed, hint);

/** The `simulate` JSON of the command line, for viewers and editors alike. */
export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const { mechanism, user } = await requireRole(args, args.params.id, "viewer");
  const settings = await readJson(args.request, simulateSettings);
  return respondWithJob(args.request, args.context, jobOwner(args.context, user), { kind: "simulate", model: modelFromSource(mechanism.source), settings });
}
