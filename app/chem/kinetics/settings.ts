// The user-facing knobs of a time-course run, their defaults and their sane ranges — shared by
// the library, the CLI, the worker and the HTTP API so every door refuses the same things.

import { MAX_SAMPLES } from "../limits";
import { SimulationInputError } from "./errors";
import type { Method } from "./integrator";

export interface SimulationSettings {
  until: number;
  samples: number;
  rtol?: number;
  atol?: number;
  method?: Method;
}

export type ResolvedSettings = Required<SimulationSettings>;

export const DEFAULT_RTOL = 1e-6;
export const DEFAULT_ATOL = 1e-10;
export const METHODS: readonly Method[] = ["auto", "stiff", "explicit"];

/** What is wrong with the settings, in words, or null when they are usable. */
export function settingsProblem(settings: SimulationSettings): string | null {
  const { until, samples, rtol = DEFAULT_RTOL, atol = DEFAULT_ATOL, method = "auto" } = settings;
  if (!(Number.isFinite(until) && until > 0)) return "the end time must be a positive number";
  if (!(Number.isInteger(samples) && samples >= 2 && samples <= MAX_SAMPLES)) {
    return `the number of samples must be a whole number from 2 to ${MAX_SAMPLES}`;
  }
  if (!(rtol >= 1e-13 && rtol < 1)) return "the relative tolerance must lie in [1e-13, 1)";
  if (!(Number.isFinite(atol) && atol > 0)) return "the absolute tolerance must be a positive number";
  if (!METHODS.includes(method)) return `the method must be one of ${METHODS.join(", ")}`;
  return null;
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
