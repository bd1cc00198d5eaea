// The ODE-to-mechanism request as the API and the page both accept it.
import { z } from "zod";
import type { AppLoadContext } from "react-router";
import { jobOwner, respondWithJob } from "./dynamics.server";
import { cleanText } from "~/shared/fields";

const MAX_ODE_BYTES = 64 * 1024;

export const realizationRequest = z.object({
  ode: cleanText("The ODE").refine((s) => s.length <= MAX_ODE_BYTES, "The ODE text is over 64 KiB."),
  shift: z.union([z.record(z.string(), z.number().finite()), z.literal("suggested")]).optional(),
  multiply: z.union([z.boolean(), z.record(z.string(), z.number().int().min(0).max(20))]).optional(),
  equivalents: z.boolean().optional(),
  complexes: z.array(cleanText("A complex").max(200)).max(200).optional(),
});

/** The MILP searches share this budget (in a worker thread, so the server stays responsive). */
const EQUIVALENTS_TIME_LIMIT_MS = 20_000;

export function runRealization(request: Request, context: AppLoadContext, user: { id: string }, input: z.infer<typeof realizationRequest>): Promise<Response> {
  const { equivalents, ...rest } = input;
  return respondWithJob(request, context, jobOwner(context, user), { kind: "realize", request: { ...rest, equivalents: equivalents ? { timeLimitMs: EQUIVALENTS_TIME_LIMIT_MS } : undefined } });
}
