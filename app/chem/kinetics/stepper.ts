// What the integration driver needs from a method: try a step, accept it, interpolate inside it,
// and how the next step size is chosen: a one-step method publishes the settings of the driver's
// shared controller; a multistep method, which picks step size and order together from its own
// history, is its own chooser.

import type { ControllerSettings } from "./step-size-controller";

/** From a tried step of size h and its error (≤ 1 passes) to the size of the next try. */
export interface StepSizeChooser {
  next(h: number, error: number, accepted: boolean): number;
}

export interface Stepper {
  /** Classical order of the propagated solution (for the initial step size guess). */
  readonly order: number;
  readonly controller: ControllerSettings | StepSizeChooser;
  /** The candidate state after the last `step`. */
  readonly yNew: Float64Array;
  /** Tries a step of size h from y; returns the error estimate in the tolerance norm (≤ 1 passes). */
  step(y: Float64Array, h: number): number;
  /** Keeps the last step: dense output now covers it; y must then be advanced to `yNew`. */
  accept(): void;
  /** The state at fraction theta ∈ [0, 1] of the last accepted step. */
  interpolate(theta: number, out: Float64Array): void;
  /** The state was changed from outside (clipping, renormalisation): cached values are stale. */
  invalidate(): void;
  readonly jacobians: number;
  /** Numeric LU factorisations of the iteration matrix (0 for explicit methods). */
  readonly factorizations: number;
}

export interface Tolerances {
  rtol: number;
  atol: number;
}

/** Root-mean-square of e/(atol + rtol·max(|y|, |ŷ|)): the norm of Hairer & Wanner's codes. */
export function errorNorm(error: Float64Array, y: Float64Array, yNew: Float64Array, { rtol, atol }: Tolerances): number {
  let sum = 0;
  for (let i = 0; i < error.length; i++) {
    const scale = atol + rtol * Math.max(Math.abs(y[i]), Math.abs(yNew[i]));
    const ratio = error[i] / scale;
    sum += ratio * ratio;
  }
  const norm = Math.sqrt(sum / Math.max(1, error.length));
  return Number.isNaN(norm) ? Number.POSITIVE_INFINITY : norm;
}
