// Every dynamics job the Dynamics panel runs (time course, equilibrium, Lyapunov exponent,
// sweep), on the text the page is showing; streamed with progress when asked.
import { z } from "zod";
import { cleanText, sourceField } from "~/shared/fields";
import { readJson } from "~/utils/json.server";
import { jobOwner, modelFromSource, respondWithJob } from "~/utils/dynamics.server";
import { methodNotAllowed, onlyMethods } from "~/utils/http";
import { requireViewAccess } from "~/utils/permissions.server";
import type { Route } from "./+types/dynamics";

const settings = {
  until: z.number().positive(),
  rtol: z.number().positive().optional(),
  atol: z.number().positive().optional(),
  method: z.enum(["auto", "stiff", "explicit"]).optional(),
};

/** Values that replace the text's parameters and initial concentrations for this run (the CLI's --set). */
const overrideValues = z.record(cleanText("The name").max(200), z.number().nonnegative().finite()).refine((values) => Object.keys(values).length <= 100, "At most 100 overrides.");
const overrides = z.object({ parameters: overrideValues.default({}), initial: overrideValues.default({}) }).optional();

const body = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("simulate"), source: sourceField, overrides, settings: z.object({ ...settings, samples: z.number().int().min(2).max(20_000) }) }),
  z.object({ kind: z.literal("equilibrium"), source: sourceField, overrides, options: z.object({ settleTime: z.number().positive().optional(), start: z.array(z.number()).optional() }) }),
  z.object({ kind: z.literal("lyapunov"), source: sourceField, overrides, options: z.object({ ...settings, transient: z.number().nonnegative().optional() }) }),
  z.object({
    kind: z.literal("sweep"),
    source: sourceField,
    overrides,
    options: z.object({
      ...settings,
      samples: z.number().int().min(2).max(5_000),
      target: z.discriminatedUnion("kind", [
        z.object({ kind: z.literal("parameter"), name: cleanText("The parameter") }),
        z.object({ kind: z.literal("initial"), species: cleanText("The species") }),
        z.object({ kind: z.literal("rate"), reaction: z.number().int().nonnegative() }),
        z.object({ kind: z.literal("step"), label: cleanText("The step label"), direction: z.enum(["forward", "backward"]).optional() }),
        z.object({ kind: z.literal("fixed"), species: cleanText("The species") }),
      ]),
      from: z.number(),
      to: z.number(),
      points: z.number().int().min(2).max(200),
      scale: z.enum(["linear", "log"]),
      species: cleanText("The species"),
      observable: z.enum(["final", "max", "period"]),
    }),
  }),
]);

const allowed = ["POST"];
const hint = "Use POST.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const { user } = await requireViewAccess(args, args.params.id);
  const input = await readJson(args.request, body);
  const model = modelFromSource(input.source, input.overrides);
  const job =
    input.kind === "simulate"
      ? { kind: input.kind, model, settings: input.settings }
      : input.kind === "sweep"
        ? { kind: input.kind, model, options: input.options }
        : { kind: input.kind, model, options: input.options };
  return respondWithJob(args.request, args.context, jobOwner(args.context, user), job as Parameters<typeof respondWithJob>[3]);
}
