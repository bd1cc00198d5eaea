// The ODE-to-mechanism request as the API and the page both accept it.
import { z } from "zod";
import { realizeOde, RealizeRequestError } from "~/chem/realize/realize-ode";
import { httpError } from "./http";

const MAX_ODE_BYTES = 64 * 1024;

export const realizationRequest = z.object({
  ode: z.string().refine((s) => s.length <= MAX_ODE_BYTES, "The ODE text is over 64 KiB."),
  shift: z.union([z.record(z.string(), z.number().finite()), z.literal("suggested")]).optional(),
  multiply: z.union([z.boolean(), z.record(z.string(), z.number().int().min(0).max(20))]).optional(),
  equivalents: z.boolean().optional(),
  complexes: z.array(z.string().max(200)).max(200).optional(),
});

/** The MILP searches share this budget, so one request cannot hold the server for long. */
const EQUIVALENTS_TIME_LIMIT_MS = 8_000;

export async function runRealization(input: z.infer<typeof realizationRequest>): Promise<Response> {
  try {
    const result = await realizeOde({
      ode: input.ode,
      shift: input.shift,
      multiply: input.multiply,
      equivalents: input.equivalents ? { timeLimitMs: EQUIVALENTS_TIME_LIMIT_MS } : undefined,
      complexes: input.complexes,
    });
    return Response.json(result);
  } catch (error) {
    if (error instanceof RealizeRequestError) return httpError(400, error.message);
    throw error;
  }
}
