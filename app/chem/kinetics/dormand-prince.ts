// Dormand–Prince 5(4), the explicit pair for non-stiff problems: FSAL, step-size PI control,
// 5th-order dense output and the stiffness test of Hairer's DOPRI5 (a cheap estimate of h·|λ|
// along the step; when it keeps exceeding the stability boundary the problem is stiff).
// Coefficients: J. R. Dormand & P. J. Prince, J. Comput. Appl. Math. 6 (1980) 19–26; dense output,
// controller and stiffness test: E. Hairer, S. P. Nørsett & G. Wanner, Solving Ordinary
// Differential Equations I, 2nd ed., Springer 1993, §II.4–II.6 and §IV.2 of volume II.

import type { OdeSystem } from "./ode-system";
import { errorNorm, type Stepper, type Tolerances } from "./stepper";

// The systems are autonomous, so the nodes c_i never enter.
const a21 = 1 / 5;
const a31 = 3 / 40, a32 = 9 / 40;
const a41 = 44 / 45, a42 = -56 / 15, a43 = 32 / 9;
const a51 = 19372 / 6561, a52 = -25360 / 2187, a53 = 64448 / 6561, a54 = -212 / 729;
const a61 = 9017 / 3168, a62 = -355 / 33, a63 = 46732 / 5247, a64 = 49 / 176, a65 = -5103 / 18656;
const a71 = 35 / 384, a73 = 500 / 1113, a74 = 125 / 192, a75 = -2187 / 6784, a76 = 11 / 84;
const e1 = 71 / 57600, e3 = -71 / 16695, e4 = 71 / 1920, e5 = -17253 / 339200, e6 = 22 / 525, e7 = -1 / 40;
const d1 = -12715105075 / 11282082432, d3 = 87487479700 / 32700410799, d4 = -10690763975 / 1880347072;
const d5 = 701980252875 / 199316789632, d6 = -1453857185 / 822651844, d7 = 69997945 / 29380423;

/** |h·λ| beyond which the explicit step is stability-limited (DOPRI5's constant). */
const STABILITY_BOUNDARY = 3.25;
const SAFETY = 0.9;
const BETA = 0.04;

export class DormandPrince implements Stepper {
  readonly order = 5;
  readonly jacobians = 0;
  readonly yNew: Float64Array;
  private readonly k: Float64Array[];
  private readonly stage: Float64Array;
  private readonly start: Float64Array;
  private readonly stage6: Float64Array;
  private readonly error: Float64Array;
  private readonly dense: Float64Array[];
  private haveK1 = false;
  private lastH = 0;
  private previousError = 1e-4;
  private rejectedLast = false;
  private stiffVotes = 0;
  private calmVotes = 0;

  constructor(
    private readonly system: OdeSystem,
    private readonly tolerances: Tolerances,
  ) {
    const n = system.names.length;
    this.yNew = new Float64Array(n);
    this.k = Array.from({ length: 7 }, () => new Float64Array(n));
    this.stage = new Float64Array(n);
    this.start = new Float64Array(n);
    this.stage6 = new Float64Array(n);
    this.error = new Float64Array(n);
    this.dense = Array.from({ length: 5 }, () => new Float64Array(n));
  }

  attempt(y: Float64Array, h: number): number {
    const { system, stage, stage6, yNew, error } = this;
    const [k1, k2, k3, k4, k5, k6, k7] = this.k;
    const n = y.length;
    this.start.set(y);
    if (!this.haveK1) {
      system.rhs(y, k1);
      this.haveK1 = true;
    }
    for (let i = 0; i < n; i++) stage[i] = y[i] + h * a21 * k1[i];
    system.rhs(stage, k2);
    for (let i = 0; i < n; i++) stage[i] = y[i] + h * (a31 * k1[i] + a32 * k2[i]);
    system.rhs(stage, k3);
    for (let i = 0; i < n; i++) stage[i] = y[i] + h * (a41 * k1[i] + a42 * k2[i] + a43 * k3[i]);
    system.rhs(stage, k4);
    for (let i = 0; i < n; i++) stage[i] = y[i] + h * (a51 * k1[i] + a52 * k2[i] + a53 * k3[i] + a54 * k4[i]);
    system.rhs(stage, k5);
    for (let i = 0; i < n; i++) stage6[i] = y[i] + h * (a61 * k1[i] + a62 * k2[i] + a63 * k3[i] + a64 * k4[i] + a65 * k5[i]);
    system.rhs(stage6, k6);
    for (let i = 0; i < n; i++) yNew[i] = y[i] + h * (a71 * k1[i] + a73 * k3[i] + a74 * k4[i] + a75 * k5[i] + a76 * k6[i]);
    system.rhs(yNew, k7);
    for (let i = 0; i < n; i++) error[i] = h * (e1 * k1[i] + e3 * k3[i] + e4 * k4[i] + e5 * k5[i] + e6 * k6[i] + e7 * k7[i]);
    this.lastH = h;
    return errorNorm(error, y, yNew, this.tolerances);
  }

  accept(): void {
    const [k1, , k3, k4, k5, k6, k7] = this.k;
    const [r1, r2, r3, r4, r5] = this.dense;
    const h = this.lastH;
    for (let i = 0; i < k1.length; i++) {
      const difference = this.yNew[i] - this.start[i];
      const spline = h * k1[i] - difference;
      r1[i] = this.start[i];
      r2[i] = difference;
      r3[i] = spline;
      r4[i] = difference - h * k7[i] - spline;
      r5[i] = h * (d1 * k1[i] + d3 * k3[i] + d4 * k4[i] + d5 * k5[i] + d6 * k6[i] + d7 * k7[i]);
    }
    this.voteOnStiffness();
    k1.set(k7); // first same as last
  }

  interpolate(theta: number, out: Float64Array): void {
    const [r1, r2, r3, r4, r5] = this.dense;
    const rest = 1 - theta;
    for (let i = 0; i < out.length; i++) out[i] = r1[i] + theta * (r2[i] + rest * (r3[i] + theta * (r4[i] + rest * r5[i])));
  }

  nextStep(h: number, error: number, accepted: boolean): number {
    if (!Number.isFinite(error)) {
      this.rejectedLast = true;
      return h * 0.2;
    }
    const growth = Math.pow(error, 0.2 - BETA * 0.75);
    if (!accepted) {
      this.rejectedLast = true;
      return h / Math.min(5, growth / SAFETY);
    }
    const factor = Math.max(0.1, Math.min(5, growth / Math.pow(this.previousError, BETA) / SAFETY));
    this.previousError = Math.max(error, 1e-4);
    const next = h / factor;
    const capped = this.rejectedLast ? Math.min(next, h) : next;
    this.rejectedLast = false;
    return capped;
  }

  invalidate(): void {
    this.haveK1 = false;
  }

  /** True once h·|λ| has exceeded the stability boundary on 15 recent accepted steps. */
  get stiff(): boolean {
    return this.stiffVotes >= 15;
  }

  private voteOnStiffness(): void {
    const [, , , , , k6, k7] = this.k;
    let numerator = 0;
    let denominator = 0;
    for (let i = 0; i < k6.length; i++) {
      numerator += (k7[i] - k6[i]) ** 2;
      denominator += (this.yNew[i] - this.stage6[i]) ** 2;
    }
    const hLambda = denominator > 0 ? this.lastH * Math.sqrt(numerator / denominator) : 0;
    if (hLambda > STABILITY_BOUNDARY) {
      this.calmVotes = 0;
      this.stiffVotes++;
    } else if (++this.calmVotes === 6) {
      this.stiffVotes = 0;
    }
  }
}
