// POST /api/v1/simulations: a time course of a text that is not (yet) a saved mechanism — a
// polynomial ODE or a mechanism — for the side-by-side check of a realization.
import { z } from "zod";
import { requireUser } from "~/utils/auth.server";
import { jobOwner, modelFromOde, modelFromSource, respondWithJob } from "~/utils/dynamics.server";
import { cleanText } from "~/shared/fields";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import type { Route } from "./+types/simulate-text";

const body = z
  .object({
    ode: cleanText("The ODE").max(64 * 1024).optional(),
    source: cleanText("The mechanism text").max(1024 * 1024).optional(),
    settings: z.object({
      until: z.number().positive(),
      samples: z.number().int().min(2).max(20_000),
      rtol: z.number().positive().optional(),
      atol: z.number().positive().optional(),
    }),
  })
  .refine((b) => (b.ode === undefined) !== (b.source === undefined), "Send either ode or source.");

const allowed = ["POST"];
const hint = "Use POST.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const user = await requireUser(args);
  const input = await readJson(args.request, body);
  const model = input.ode !== undefined ? modelFromOde(input.ode) : modelFromSource(input.source!);
  return respondWithJob(args.request, args.context, jobOwner(args.context, user), { kind: "simulate", model, settings: input.settings });
}
