// RODAS4: a 6-stage, L-stable, stiffly accurate Rosenbrock method of order 4 with an embedded
// order-3 estimate and a 3rd-order dense output. One Jacobian and one LU factorisation per step,
// no Newton iterations — the right tool for stiff kinetics. Coefficients (transformed form, W = I/(hγ) − J)
// and the predictive step-size controller of Gustafsson: E. Hairer & G. Wanner, Solving Ordinary
// Differential Equations II, 2nd ed., Springer 1996, §IV.7, and the RODAS code
// that accompanies the book.

import { DenseLu } from "./dense-lu";
import type { OdeSystem } from "./ode-system";
import { SparseShiftedLu } from "./sparse-lu";
import { errorNorm, type Stepper, type Tolerances } from "./stepper";

const gamma = 0.25;
const a21 = 1.544;
const a31 = 0.9466785280815826, a32 = 0.2557011698983284;
const a41 = 3.314825187068521, a42 = 2.896124015972201, a43 = 0.9986419139977817;
const a51 = 1.221224509226641, a52 = 6.019134481288629, a53 = 12.53708332932087, a54 = -0.687886036105895;
const c21 = -5.6688;
const c31 = -2.430093356833875, c32 = -0.2063599157091915;
const c41 = -0.1073529058151375, c42 = -9.594562251023355, c43 = -20.47028614809616;
const c51 = 7.496443313967647, c52 = -10.24680431464352, c53 = -33.99990352819905, c54 = 11.70890893206160;
const c61 = 8.083246795921522, c62 = -7.981132988064893, c63 = -31.52159432874371, c64 = 16.31930543123136, c65 = -6.058818238834054;
const d21 = 10.12623508344586, d22 = -7.487995877610167, d23 = -34.80091861555747, d24 = -7.992771707568823, d25 = 1.025137723295662;
const d31 = -0.6762803392801253, d32 = 6.087714651680015, d33 = 16.43084320892478, d34 = 24.76722511418386, d35 = -6.594389125716872;

const SAFETY = 0.9;
/** Below this size dense LU is as fast; above this fill the sparse factors stop paying off. */
const SPARSE_MIN_SIZE = 40;
const SPARSE_MAX_FILL = 0.3;

interface ShiftedSolver {
  solve(b: Float64Array): void;
}

export class Rodas4 implements Stepper {
  readonly order = 4;
  readonly yNew: Float64Array;
  jacobians = 0;
  private readonly n: number;
  private readonly jacobian: Float64Array;
  private readonly sparse: SparseShiftedLu | null;
  private denseLu: DenseLu | null = null;
  private readonly f0: Float64Array;
  private readonly f: Float64Array;
  private readonly stage: Float64Array;
  private readonly start: Float64Array;
  private readonly k: Float64Array[];
  private readonly dense: Float64Array[];
  private jacobianCurrent = false;
  private previousAccepted: { h: number; error: number } | null = null;
  private rejectedLast = false;

  constructor(
    private readonly system: OdeSystem,
    private readonly tolerances: Tolerances,
  ) {
    const n = system.names.length;
    this.n = n;
    this.yNew = new Float64Array(n);
    this.jacobian = new Float64Array(n * n);
    this.sparse = sparseSolver(system);
    this.f0 = new Float64Array(n);
    this.f = new Float64Array(n);
    this.stage = new Float64Array(n);
    this.start = new Float64Array(n);
    this.k = Array.from({ length: 6 }, () => new Float64Array(n));
    this.dense = Array.from({ length: 4 }, () => new Float64Array(n));
  }

  attempt(y: Float64Array, h: number): number {
    const { n, system, stage, f, yNew } = this;
    const [k1, k2, k3, k4, k5, k6] = this.k;
    this.start.set(y);
    if (!this.jacobianCurrent) {
      // A rejected step retries from the same point: J and f(y) stay valid until the state moves.
      system.rhs(y, this.f0);
      system.jacobian(y, this.jacobian);
      this.jacobians++;
      this.jacobianCurrent = true;
    }
    const lu = this.factor(1 / (h * gamma));
    if (!lu) return Number.POSITIVE_INFINITY;

    const inverseH = 1 / h;
    k1.set(this.f0);
    lu.solve(k1);

    for (let i = 0; i < n; i++) stage[i] = y[i] + a21 * k1[i];
    system.rhs(stage, f);
    for (let i = 0; i < n; i++) k2[i] = f[i] + inverseH * c21 * k1[i];
    lu.solve(k2);

    for (let i = 0; i < n; i++) stage[i] = y[i] + a31 * k1[i] + a32 * k2[i];
    system.rhs(stage, f);
    for (let i = 0; i < n; i++) k3[i] = f[i] + inverseH * (c31 * k1[i] + c32 * k2[i]);
    lu.solve(k3);

    for (let i = 0; i < n; i++) stage[i] = y[i] + a41 * k1[i] + a42 * k2[i] + a43 * k3[i];
    system.rhs(stage, f);
    for (let i = 0; i < n; i++) k4[i] = f[i] + inverseH * (c41 * k1[i] + c42 * k2[i] + c43 * k3[i]);
    lu.solve(k4);

    for (let i = 0; i < n; i++) stage[i] = y[i] + a51 * k1[i] + a52 * k2[i] + a53 * k3[i] + a54 * k4[i];
    system.rhs(stage, f);
    for (let i = 0; i < n; i++) k5[i] = f[i] + inverseH * (c51 * k1[i] + c52 * k2[i] + c53 * k3[i] + c54 * k4[i]);
    lu.solve(k5);

    // Stiffly accurate: the embedded (order 3) solution is stage 6's input, the last stage the error.
    for (let i = 0; i < n; i++) stage[i] += k5[i];
    system.rhs(stage, f);
    for (let i = 0; i < n; i++) k6[i] = f[i] + inverseH * (c61 * k1[i] + c62 * k2[i] + c63 * k3[i] + c64 * k4[i] + c65 * k5[i]);
    lu.solve(k6);
    for (let i = 0; i < n; i++) yNew[i] = stage[i] + k6[i];

    return errorNorm(k6, y, yNew, this.tolerances);
  }

  /** Factors I/(hγ) − J: sparse when the pattern allows, dense partial pivoting otherwise. */
  private factor(shift: number): ShiftedSolver | null {
    if (this.sparse?.factor(shift, this.jacobian)) return this.sparse;
    this.denseLu ??= new DenseLu(this.n);
    return this.denseLu.factorShifted(shift, this.jacobian) ? this.denseLu : null;
  }

  accept(): void {
    const [k1, k2, k3, k4, k5] = this.k;
    const [r0, r1, r2, r3] = this.dense;
    r0.set(this.start);
    r1.set(this.yNew);
    for (let i = 0; i < this.n; i++) {
      r2[i] = d21 * k1[i] + d22 * k2[i] + d23 * k3[i] + d24 * k4[i] + d25 * k5[i];
      r3[i] = d31 * k1[i] + d32 * k2[i] + d33 * k3[i] + d34 * k4[i] + d35 * k5[i];
    }
    this.jacobianCurrent = false;
  }

  interpolate(theta: number, out: Float64Array): void {
    const [r0, r1, r2, r3] = this.dense;
    const rest = 1 - theta;
    for (let i = 0; i < out.length; i++) out[i] = r0[i] * rest + theta * (r1[i] + rest * (r2[i] + theta * r3[i]));
  }

  nextStep(h: number, error: number, accepted: boolean): number {
    if (!Number.isFinite(error)) {
      this.rejectedLast = true;
      return h * 0.2;
    }
    // h_new = h / factor with factor in [1/6, 5]: at most 6× growth, at least 5× shrink.
    let factor = Math.max(1 / 6, Math.min(5, Math.pow(error, 0.25) / SAFETY));
    if (!accepted) {
      this.rejectedLast = true;
      return h / factor;
    }
    if (this.previousAccepted) {
      // Gustafsson's predictive controller: damp growth when the error rose over the last steps.
      const { h: previousH, error: previousError } = this.previousAccepted;
      const predictive = ((previousH / h) * Math.pow((error * error) / previousError, 0.25)) / SAFETY;
      factor = Math.max(factor, Math.max(1 / 6, Math.min(5, predictive)));
    }
    this.previousAccepted = { h, error: Math.max(1e-2, error) };
    const next = h / factor;
    const capped = this.rejectedLast ? Math.min(next, h) : next;
    this.rejectedLast = false;
    return capped;
  }

  invalidate(): void {
    this.jacobianCurrent = false;
  }
}

function sparseSolver(system: OdeSystem): SparseShiftedLu | null {
  if (!system.sparsity || system.names.length < SPARSE_MIN_SIZE) return null;
  const solver = new SparseShiftedLu(system.sparsity);
  return solver.fillRatio <= SPARSE_MAX_FILL ? solver : null;
}
