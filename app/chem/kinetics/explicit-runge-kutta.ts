// Embedded explicit Runge–Kutta pairs, driven by their tableau: one stage loop for any pair that
// is "first same as last" (the last stage is f at the new solution, so it is the next step's first
// stage), with the continuous extension and the stiffness test of Hairer's DOPRI5 (E. Hairer,
// S. P. Nørsett & G. Wanner, Solving Ordinary Differential Equations I, 2nd ed., Springer 1993,
// §II.4–II.6, and §IV.2 of volume II). The systems are autonomous, so the nodes c_i never enter.

import type { OdeSystem } from "./ode-system";
import type { ControllerSettings } from "./step-size-controller";
import { errorNorm, type Stepper, type Tolerances } from "./stepper";
import { scaledSum, type ScaledSum } from "./weighted-sums";

/** An embedded explicit pair with s stages, numbered from 0; stage 0 is f(y). */
export interface ExplicitPair {
  /** Order of the propagated solution and of the embedded one. */
  readonly order: number;
  readonly embeddedOrder: number;
  /**
   * Stages 1 … s − 2: row i − 1 holds a_i0 … a_i,i−1, the weights of the earlier stages in stage
   * i's input y + h·Σ a_ij k_j. The last stage's input is the new solution (first same as last).
   */
  readonly a: readonly (readonly number[])[];
  /** Weights of the propagated solution y + h·Σ b_j k_j (the last stage's weight is 0). */
  readonly b: readonly number[];
  /** Error weights b_j − b̂_j over all s stages: the difference to the embedded solution. */
  readonly e: readonly number[];
  /** The continuous extension's fifth coefficient, Σ d_j k_j, in DOPRI5's form. */
  readonly dense: readonly number[];
  /**
   * |h·λ| beyond which a step is stability-limited. The test estimates λ from the last two
   * stages, which must share the node c = 1.
   */
  readonly stabilityBoundary: number;
  readonly controller: ControllerSettings;
}

/** Accepted steps in a row over the stability boundary before the problem counts as stiff. */
const STIFF_VOTES = 15;
/** Calm accepted steps in a row that clear the stiff votes. */
const CALM_VOTES = 6;
/**
 * An accuracy-limited step of a method of order p has h·|λ| of the order of tol^(1/p) (common
 * practice, no source). At tight tolerances a stability-limited explicit step sits below the
 * stability boundary (the error estimate catches the growing instability first), yet still far above
 * any accuracy-limited one: measured here with Dormand–Prince on four non-stiff models (Lorenz,
 * Rössler, Lotka–Volterra, Brusselator) h·|λ| stayed below 15·rtol^(1/5) at rtol 1e-6 … 1e-10, while on
 * Robertson's problem it stayed above 40·rtol^(1/5). A step counts as stability-limited above this
 * multiple of rtol^(1/p), or above the stability boundary, whichever is lower.
 */
const ACCURACY_LIMITED_MULTIPLE = 30;

export class ExplicitRungeKutta implements Stepper {
  readonly order: number;
  readonly controller: ControllerSettings;
  readonly jacobians = 0;
  readonly factorizations = 0;
  readonly yNew: Float64Array;
  private readonly k: Float64Array[];
  /** The input of the last stage before the final one: kept for the stiffness test. */
  private readonly stage: Float64Array;
  private readonly start: Float64Array;
  private readonly error: Float64Array;
  private readonly dense: Float64Array[];
  private readonly sums: { a: ScaledSum[]; b: ScaledSum; e: ScaledSum; dense: ScaledSum };
  private haveFirstStage = false;
  private lastH = 0;
  private stiffVotes = 0;
  private calmVotes = 0;
  /** h·|λ| above which a step counts as limited by stability, not accuracy. */
  private readonly stiffnessThreshold: number;

  constructor(
    private readonly pair: ExplicitPair,
    private readonly system: OdeSystem,
    private readonly tolerances: Tolerances,
  ) {
    const n = system.names.length;
    this.order = pair.order;
    this.controller = pair.controller;
    this.yNew = new Float64Array(n);
    this.k = Array.from({ length: pair.e.length }, () => new Float64Array(n));
    this.stage = new Float64Array(n);
    this.start = new Float64Array(n);
    this.error = new Float64Array(n);
    this.dense = Array.from({ length: 5 }, () => new Float64Array(n));
    this.sums = { a: pair.a.map((row) => scaledSum(row)), b: scaledSum(pair.b), e: scaledSum(pair.e), dense: scaledSum(pair.dense) };
    this.stiffnessThreshold = Math.min(pair.stabilityBoundary, ACCURACY_LIMITED_MULTIPLE * Math.pow(tolerances.rtol, 1 / pair.order));
  }

  step(y: Float64Array, h: number): number {
    const { system, stage, yNew, error, k, sums } = this;
    this.start.set(y);
    if (!this.haveFirstStage) {
      system.rhs(y, k[0]);
      this.haveFirstStage = true;
    }
    for (let i = 1; i < k.length - 1; i++) {
      sums.a[i - 1](stage, y, h, k);
      system.rhs(stage, k[i]);
    }
    sums.b(yNew, y, h, k);
    system.rhs(yNew, k[k.length - 1]);
    sums.e(error, null, h, k);
    this.lastH = h;
    return errorNorm(error, y, yNew, this.tolerances);
  }

  accept(): void {
    const { k, start, yNew } = this;
    const [r1, r2, r3, r4, r5] = this.dense;
    const h = this.lastH;
    const first = k[0];
    const last = k[k.length - 1];
    this.sums.dense(r5, null, h, k);
    for (let i = 0; i < first.length; i++) {
      const difference = yNew[i] - start[i];
      const spline = h * first[i] - difference;
      r1[i] = start[i];
      r2[i] = difference;
      r3[i] = spline;
      r4[i] = difference - h * last[i] - spline;
    }
    this.voteOnStiffness();
    first.set(last);
  }

  interpolate(theta: number, out: Float64Array): void {
    const [r1, r2, r3, r4, r5] = this.dense;
    const rest = 1 - theta;
    for (let i = 0; i < out.length; i++) out[i] = r1[i] + theta * (r2[i] + rest * (r3[i] + theta * (r4[i] + rest * r5[i])));
  }

  invalidate(): void {
    this.haveFirstStage = false;
  }

  /** True once enough recent accepted steps were limited by stability rather than accuracy. */
  get stiff(): boolean {
    return this.stiffVotes >= STIFF_VOTES;
  }

  private voteOnStiffness(): void {
    const { k, stage, yNew } = this;
    const beforeLast = k[k.length - 2];
    const last = k[k.length - 1];
    let numerator = 0;
    let denominator = 0;
    for (let i = 0; i < last.length; i++) {
      const slope = last[i] - beforeLast[i];
      const distance = yNew[i] - stage[i];
      numerator += slope * slope;
      denominator += distance * distance;
    }
    const hLambda = denominator > 0 ? this.lastH * Math.sqrt(numerator / denominator) : 0;
    if (hLambda > this.stiffnessThreshold) {
      this.calmVotes = 0;
      this.stiffVotes++;
    } else if (++this.calmVotes === CALM_VOTES) {
      this.stiffVotes = 0;
    }
  }
}
