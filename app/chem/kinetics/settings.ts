// The user-facing knobs of a time-course run, their defaults and their sane ranges — one zod schema
// shared by the library, the CLI, the worker and the HTTP API (app/shared/job-schemas.ts builds
// every job kind on it), so every door refuses the same things in the same words.

import { z } from "zod";
import { MAX_SAMPLES } from "../limits";
import { SimulationInputError } from "./errors";
import type { Method, MethodName } from "./integrator";

export const DEFAULT_RTOL = 1e-6;
export const DEFAULT_ATOL = 1e-10;
export const METHODS = ["auto", "stiff", "explicit", "bdf", "rodas4"] as const satisfies readonly Method[];
/** How results name the method that ran. */
export const METHOD_NAMES: Record<MethodName, string> = { "dormand-prince": "Dormand–Prince 5(4)", rodas4: "RODAS4", bdf: "variable-order BDF" };

/** How an integration is carried out: tolerances and method, shared by every kind of run. */
export const integrationSettings = z.object({
  rtol: z.number({ message: "the relative tolerance must be a number" }).min(1e-13, "the relative tolerance must lie in [1e-13, 1)").lt(1, "the relative tolerance must lie in [1e-13, 1)").optional(),
  atol: z.number({ message: "the absolute tolerance must be a number" }).positive("the absolute tolerance must be a positive number").optional(),
  method: z.enum(METHODS, { message: `the method must be one of ${METHODS.join(", ")}` }).optional(),
});

/** The end time of a run. */
export const untilField = z.number({ message: "the end time must be a number" }).positive("the end time must be a positive number");

/** A whole number of samples from 2 to `max`. */
export function samplesField(max: number) {
  const message = `the number of samples must be a whole number from 2 to ${max}`;
  return z.number({ message }).int(message).min(2, message).max(max, message);
}

export const simulationSettings = integrationSettings.extend({ until: untilField, samples: samplesField(MAX_SAMPLES) });

export type SimulationSettings = z.infer<typeof simulationSettings>;
export type ResolvedSettings = Required<SimulationSettings>;

/** What is wrong with the settings, in words, or null when they are usable. */
export function settingsProblem(settings: SimulationSettings): string | null {
  const parsed = simulationSettings.safeParse(settings);
  return parsed.success ? null : parsed.error.issues[0].message;
}

export function resolveSettings(settings: SimulationSettings): ResolvedSettings {
  const problem = settingsProblem(settings);
  if (problem) throw new SimulationInputError(problem);
  return {
    until: settings.until,
    samples: settings.samples,
    rtol: settings.rtol ?? DEFAULT_RTOL,
    atol: settings.atol ?? DEFAULT_ATOL,
    method: settings.method ?? "auto",
  };
}
