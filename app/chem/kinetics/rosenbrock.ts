// Rosenbrock methods, driven by their tableau in the transformed form of E. Hairer & G. Wanner,
// Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, §IV.7: with W = I/(hγ) − J,
//   W·u_i = f(y + Σ_{j<i} a_ij u_j) + Σ_{j<i} (c_ij / h)·u_j,   y_1 = y + Σ m_j u_j,
// so each step costs one Jacobian and one LU factorisation and no Newton iterations — the right
// tool for stiff kinetics. The systems are autonomous, so the nodes and ∂f/∂t never enter.

import type { OdeSystem } from "./ode-system";
import { ShiftedLu } from "./shifted-lu";
import type { ControllerSettings } from "./step-size-controller";
import { errorNorm, type Stepper, type Tolerances } from "./stepper";
import { accumulatedSum, scaledSum, type AccumulatedSum, type ScaledSum } from "./weighted-sums";

/** A Rosenbrock method with s stages, numbered from 0, in the transformed form. */
export interface RosenbrockMethod {
  /** Order of the propagated solution and of the embedded one. */
  readonly order: number;
  readonly embeddedOrder: number;
  /** The diagonal γ shared by every stage. */
  readonly gamma: number;
  /** Stages 1 … s − 1: row i − 1 holds a_i0 … a_i,i−1. */
  readonly a: readonly (readonly number[])[];
  /** Stages 1 … s − 1: row i − 1 holds c_i0 … c_i,i−1. */
  readonly c: readonly (readonly number[])[];
  /** Weights of the propagated solution. */
  readonly m: readonly number[];
  /** Error weights m_j − m̂_j: the difference to the embedded solution. */
  readonly e: readonly number[];
  /**
   * The continuous extension of Hairer's RODAS codes: with r_k = Σ d_kj u_j,
   * y(θ) = (1 − θ)·y_0 + θ·(y_1 + (1 − θ)·(r_0 + θ·r_1)).
   */
  readonly dense: readonly [readonly number[], readonly number[]];
  readonly controller: ControllerSettings;
}

export class Rosenbrock implements Stepper {
  readonly order: number;
  readonly controller: ControllerSettings;
  readonly yNew: Float64Array;
  jacobians = 0;
  private readonly jacobian: Float64Array;
  private readonly lu: ShiftedLu;
  private readonly f0: Float64Array;
  private readonly f: Float64Array;
  private readonly stage: Float64Array;
  private readonly start: Float64Array;
  private readonly error: Float64Array;
  private readonly u: Float64Array[];
  private readonly dense: Float64Array[];
  private readonly sums: { a: AccumulatedSum[]; c: ScaledSum[]; m: AccumulatedSum; e: ScaledSum; dense: ScaledSum[] };
  private jacobianCurrent = false;

  constructor(
    private readonly method: RosenbrockMethod,
    private readonly system: OdeSystem,
    private readonly tolerances: Tolerances,
  ) {
    const n = system.names.length;
    this.order = method.order;
    this.controller = method.controller;
    this.yNew = new Float64Array(n);
    this.jacobian = new Float64Array(n * n);
    this.lu = new ShiftedLu(system);
    this.f0 = new Float64Array(n);
    this.f = new Float64Array(n);
    this.stage = new Float64Array(n);
    this.start = new Float64Array(n);
    this.error = new Float64Array(n);
    this.u = Array.from({ length: method.m.length }, () => new Float64Array(n));
    this.dense = Array.from({ length: 4 }, () => new Float64Array(n));
    const { a, c, m, e, dense } = method;
    this.sums = { a: a.map((row) => accumulatedSum(row)), c: c.map((row) => scaledSum(row)), m: accumulatedSum(m), e: scaledSum(e), dense: dense.map((row) => scaledSum(row)) };
  }

  step(y: Float64Array, h: number): number {
    const { system, stage, f, yNew, error, u, method, sums } = this;
    this.start.set(y);
    if (!this.jacobianCurrent) {
      // A rejected step retries from the same point: J and f(y) stay valid until the state moves.
      system.rhs(y, this.f0);
      system.jacobian(y, this.jacobian);
      this.jacobians++;
      this.jacobianCurrent = true;
    }
    const { lu } = this;
    if (!lu.factor(1 / (h * method.gamma), this.jacobian)) return Number.POSITIVE_INFINITY;

    const inverseH = 1 / h;
    u[0].set(this.f0);
    lu.solve(u[0]);
    for (let s = 1; s < u.length; s++) {
      sums.a[s - 1](stage, y, u);
      system.rhs(stage, f);
      sums.c[s - 1](u[s], f, inverseH, u);
      lu.solve(u[s]);
    }
    sums.m(yNew, y, u);
    sums.e(error, null, 1, u);
    return errorNorm(error, y, yNew, this.tolerances);
  }

  get factorizations(): number {
    return this.lu.factorizations;
  }

  accept(): void {
    const [y0, y1, r0, r1] = this.dense;
    y0.set(this.start);
    y1.set(this.yNew);
    this.sums.dense[0](r0, null, 1, this.u);
    this.sums.dense[1](r1, null, 1, this.u);
    this.jacobianCurrent = false;
  }

  interpolate(theta: number, out: Float64Array): void {
    const [y0, y1, r0, r1] = this.dense;
    const rest = 1 - theta;
    for (let i = 0; i < out.length; i++) out[i] = y0[i] * rest + theta * (y1[i] + rest * (r0[i] + theta * r1[i]));
  }

  invalidate(): void {
    this.jacobianCurrent = false;
  }
}
