// POST /api/v1/simulations: a time course of a text that is not (yet) a saved mechanism — a
// polynomial ODE or a mechanism — for the side-by-side check of a realization.
import { textSimulationRequest } from "~/shared/job-schemas";
import { requireUser } from "~/utils/auth.server";
import { jobOwner, modelFromOde, modelFromSource, respondWithJob } from "~/utils/dynamics.server";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import type { Route } from "./+types/simulate-text";

const allowed = ["POST"];
const hint = "Use POST.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const user = await requireUser(args);
  const input = await readJson(args.request, textSimulationRequest);
  const model = input.ode !== undefined ? modelFromOde(input.ode) : modelFromSource(input.source!);
  return respondWithJob(args.request, args.context, jobOwner(args.context, user), { kind: "simulate", model, settings: input.settings });
}
