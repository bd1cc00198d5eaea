// POST /api/v1/mechanisms/:id/sensitivities { until, samples, vary?, set? } — normalized
// sensitivities ∂ln x/∂ln p over time, the command line's `sensitivity --json` (viewers and editors).
import { overrides, sensitivitySettings } from "~/shared/job-schemas";
import { jobOwner, modelFromSource, respondWithJob } from "~/utils/dynamics.server";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/sensitivities";

const allowed = ["POST"];
const hint = "Use POST with { until, samples, vary? }.";
export const loader = onlyMethods(allowed, hint);
const body = sensitivitySettings.extend({ set: overrides.optional() });

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const { mechanism, user } = await requireRole(args, args.params.id, "viewer");
  const { set, ...options } = await readJson(args.request, body);
  return respondWithJob(args.request, args.context, jobOwner(args.context, user), { kind: "sensitivity", model: modelFromSource(mechanism.source, set), options });
}
