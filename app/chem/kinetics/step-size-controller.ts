// The step-size controller every one-step method shares: from the error estimate of a step (in the
// tolerance norm, ≤ 1 passes) to the next step size. A method names its published settings; the
// controller keeps the memory (the last accepted step and error, whether the last try failed).
// Formulas: the elementary controller h·(1/err)^α with a safety factor and the PI memory
// (err_prev)^β (E. Hairer & G. Wanner, Solving Ordinary Differential Equations II, 2nd ed.,
// Springer 1996, §IV.2), and Gustafsson's predictive controller as in the RODAS code that
// accompanies that book.

export interface ControllerSettings {
  /** α: 1/(q + 1) for an embedded estimate of order q (less 0.75·β with PI memory). */
  readonly exponent: number;
  /** β: the PI memory's exponent on the previous accepted error; 0 for none. */
  readonly beta: number;
  /** Gustafsson's predictive correction: slows growth when the error rises from step to step. */
  readonly predictive: boolean;
  readonly safety: number;
  /** Bounds on h_new / h: at most `maxGrowth`, at least 1 / `maxShrink`. */
  readonly maxGrowth: number;
  readonly maxShrink: number;
  /** The remembered error never goes below this, so one lucky step cannot unleash growth. */
  readonly errorFloor: number;
}

/** What the step is cut to when its error is not even a number (overflow, a failed factorisation). */
const NON_FINITE_SHRINK = 0.2;

export class StepSizeController {
  private previousError: number;
  /** The last accepted step size; 0 before the first. */
  private previousH = 0;
  private rejectedLast = false;

  constructor(private readonly settings: ControllerSettings) {
    this.previousError = settings.errorFloor;
  }

  /** The next step size after a step of size h with error `error` that was (or was not) accepted. */
  next(h: number, error: number, accepted: boolean): number {
    if (!Number.isFinite(error)) {
      this.rejectedLast = true;
      return h * NON_FINITE_SHRINK;
    }
    const { exponent, beta, predictive, safety, errorFloor } = this.settings;
    // Worked with the divisor h / h_new, as the published codes do.
    const divisorFromError = Math.pow(error, exponent);
    if (!accepted) {
      this.rejectedLast = true;
      return h / this.bounded(divisorFromError / safety);
    }
    let divisor = this.bounded(divisorFromError / Math.pow(this.previousError, beta) / safety);
    if (predictive && this.previousH > 0) {
      const predicted = ((this.previousH / h) * Math.pow((error * error) / this.previousError, exponent)) / safety;
      divisor = Math.max(divisor, this.bounded(predicted));
    }
    this.previousError = Math.max(errorFloor, error);
    this.previousH = h;
    const next = h / divisor;
    // Right after a rejection, do not grow: the failed size is known to be too large.
    const capped = this.rejectedLast ? Math.min(next, h) : next;
    this.rejectedLast = false;
    return capped;
  }

  private bounded(divisor: number): number {
    return Math.max(1 / this.settings.maxGrowth, Math.min(this.settings.maxShrink, divisor));
  }
}
