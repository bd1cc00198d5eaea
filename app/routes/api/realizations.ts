import { requireUser } from "~/utils/auth.server";
import { httpError } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { realizationRequest, runRealization } from "~/utils/realization.server";
import type { Route } from "./+types/realizations";

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return httpError(405, "Use POST with { ode, shift?, multiply? }.");
  const user = await requireUser(args);
  const input = await readJson(args.request, realizationRequest);
  return runRealization(args.request, args.context, user, input);
}
