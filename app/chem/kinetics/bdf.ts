// A variable-order (1–5) multistep method for stiff problems: the numerical differentiation
// formulas (NDF, backward differentiation with Klopfenstein's correction κ) in backward-difference
// form with quasi-constant step size, as published by L. F. Shampine & M. W. Reichelt, "The MATLAB
// ODE Suite", SIAM J. Sci. Comput. 18 (1997) 1–22, §2; with κ = 0 they are the classic BDF of
// G. D. Byrne & A. C. Hindmarsh, ACM TOMS 1 (1975) 71–96 (see E. Hairer & G. Wanner, Solving
// Ordinary Differential Equations II, 2nd ed., Springer 1996, §III.5–III.7 and §IV.8).
//
// The history is the array D of backward differences scaled to the current step h (D[0] = y_n,
// D[1] = y_n − y_{n−1}, …). A step predicts y⁰ = Σ_{j≤k} D[j] and solves the corrector
//   y − y⁰ = c·f(y) − ψ,   c = h/α_k,   ψ = Σ_{j=1..k} γ_j D[j] / α_k
// by modified Newton with the matrix I − c·J. A change of h re-interpolates D (their eq. (2.7),
// the matrices R and U), which is cheap; what is dear is a Jacobian and an LU factorisation, so
// both are kept across steps: J until Newton fails to converge with it, the LU while c stays
// within 30 % of the c it was factored for (the rule of the Byrne–Hindmarsh codes, with their
// correction 2/(1 + c/c_LU) of the Newton increment). The step size is left alone unless it would
// grow by at least 20 % or must shrink, so most steps reuse the factors.

import type { OdeSystem } from "./ode-system";
import { ShiftedLu } from "./shifted-lu";
import { errorNorm, type StepSizeChooser, type Stepper, type Tolerances } from "./stepper";

export const MAX_ORDER = 5;

/** Klopfenstein–Shampine κ_k of the NDF of order k (Shampine & Reichelt 1997, Table 1). */
const KAPPA = [0, -0.185, -1 / 9, -0.0823, -0.0415, 0];
/** γ_k = Σ_{j=1..k} 1/j. */
export const GAMMA = KAPPA.map((_, k) => Array.from({ length: k }, (_, j) => 1 / (j + 1)).reduce((a, b) => a + b, 0));
export const ALPHA = KAPPA.map((kappa, k) => (1 - kappa) * GAMMA[k]);
/** The local error of order k is ERROR_CONSTANT[k] times the Newton correction y − y⁰. */
export const ERROR_CONSTANT = KAPPA.map((kappa, k) => kappa * GAMMA[k] + 1 / (k + 1));

/** Width of the re-scaling matrices: orders 0 … MAX_ORDER. */
const SIZE = MAX_ORDER + 1;
/** U = R(1), the same for every step (declared below, hoisted). */
const UNIT_RATIO_MATRIX = differenceMatrix(1, new Float64Array(SIZE * SIZE));

const NEWTON_MAX_ITERATIONS = 4;
/** The contraction rate assumed before a new matrix has shown its own. */
const INITIAL_RATE = 0.7;
/** The LU is refactored once c has moved this far (relatively) from the c it was built for. */
const LU_REUSE_RATIO = 0.3;
/** Bounds on h_new / h after an accepted step (shrinking after a rejection is bounded below). */
const MAX_GROWTH = 10;
const MIN_FACTOR = 0.2;
/** Growth below this is not worth disturbing the history and the factors for. */
const MIN_GROWTH = 1.2;
const NEWTON_FAILURE_SHRINK = 0.25;
/** The share of the tolerance a step may dip below 0 (non-negative systems); see `undershoot`. */
const UNDERSHOOT_FRACTION = 1e-8;
/** Relative round-off of the state, 100 ε. */
const ROUND_OFF = 100 * Number.EPSILON;

export interface BdfOptions extends Tolerances {
  /** Highest order the method may use (1–5); lower orders are more stable near the imaginary axis. */
  maxOrder?: number;
}

export class Bdf implements Stepper, StepSizeChooser {
  readonly controller: StepSizeChooser = this;
  readonly yNew: Float64Array;
  jacobians = 0;
  private readonly tolerances: Tolerances;
  private readonly maxOrder: number;
  private readonly newtonTolerance: number;
  private readonly lu: ShiftedLu;
  private readonly jacobian: Float64Array;
  /** Backward differences D[0 … MAX_ORDER + 2], scaled to the step `historyH`. */
  private readonly differences: Float64Array[];
  private historyH = 0;
  private currentOrder = 1;
  private nextOrder = 1;
  /** Accepted steps since the last change of step size or order. */
  private equalSteps = 0;
  private readonly predicted: Float64Array;
  /** Scratch of `rescale`: R(ρ), R·U and one component's differences, allocated once. */
  private readonly ratioMatrix = new Float64Array(SIZE * SIZE);
  private readonly rescaling = new Float64Array(SIZE * SIZE);
  private readonly column = new Float64Array(SIZE);
  private readonly psi: Float64Array;
  /** The Newton correction y − y⁰ of the last step. */
  private readonly correction: Float64Array;
  private readonly f: Float64Array;
  private readonly increment: Float64Array;
  private readonly scratch: Float64Array;
  /** D[0 … order] of the last accepted step, for dense output. */
  private readonly interpolant: Float64Array[];
  private interpolantOrder = 0;
  /** c = h/α_k the factors were built for; 0 when there are none for the current Jacobian. */
  private factoredC = 0;
  /** The Jacobian was evaluated during the current step (a fresh one cannot help a failed Newton). */
  private jacobianFresh = false;
  private rate = INITIAL_RATE;
  private iterations = 0;
  private newtonFailed = false;
  private stateChanged = false;

  constructor(
    private readonly system: OdeSystem,
    options: BdfOptions,
  ) {
    const n = system.names.length;
    this.tolerances = { rtol: options.rtol, atol: options.atol };
    this.maxOrder = Math.min(MAX_ORDER, Math.max(1, Math.round(options.maxOrder ?? MAX_ORDER)));
    // Shampine & Reichelt's corrector tolerance, in units of the error norm.
    this.newtonTolerance = Math.max((10 * Number.EPSILON) / options.rtol, Math.min(0.03, Math.sqrt(options.rtol)));
    this.lu = new ShiftedLu(system);
    this.jacobian = new Float64Array(n * n);
    this.differences = Array.from({ length: MAX_ORDER + 3 }, () => new Float64Array(n));
    this.interpolant = Array.from({ length: MAX_ORDER + 1 }, () => new Float64Array(n));
    this.yNew = new Float64Array(n);
    this.predicted = new Float64Array(n);
    this.psi = new Float64Array(n);
    this.correction = new Float64Array(n);
    this.f = new Float64Array(n);
    this.increment = new Float64Array(n);
    this.scratch = new Float64Array(n);
  }

  get order(): number {
    return this.currentOrder;
  }

  get factorizations(): number {
    return this.lu.factorizations;
  }

  step(y: Float64Array, h: number): number {
    if (this.historyH === 0) this.restart(y, h);
    else if (this.stateChanged) this.adopt(y, h);
    this.stateChanged = false;
    if (h !== this.historyH) this.rescale(h / this.historyH, h);
    this.predict();
    const c = h / ALPHA[this.currentOrder];
    let converged = this.correct(c);
    if (!converged && !this.jacobianFresh) {
      this.evaluateJacobian(this.predicted);
      converged = this.correct(c);
    }
    if (!converged) {
      this.newtonFailed = true;
      return Number.POSITIVE_INFINITY;
    }
    const { scratch, correction } = this;
    const constant = ERROR_CONSTANT[this.currentOrder];
    for (let i = 0; i < scratch.length; i++) scratch[i] = constant * correction[i];
    const error = errorNorm(scratch, y, this.yNew, this.tolerances);
    return this.system.nonNegative ? Math.max(error, this.undershoot(y)) : error;
  }

  /**
   * How far the candidate state dips below 0, as an error: a multistep formula extrapolates a
   * collapsing concentration past 0 by up to the tolerance, and clipping that back adds the amount
   * to every conserved total. Counted against 10⁻⁸ of the tolerance, such a step is
   * retried shorter; measured on Robertson's problem at rtol 1e-3 it costs a few % more steps and keeps
   * the total to 1e-14 (clipping alone: 7e-7).
   */
  private undershoot(y: Float64Array): number {
    const { scratch, yNew } = this;
    let size = 0;
    for (let i = 0; i < yNew.length; i++) size = Math.max(size, Math.abs(yNew[i]));
    // Round-off below 0 on a component that has run out is no undershoot, and no step size cures it.
    const floor = -ROUND_OFF * size;
    let any = false;
    for (let i = 0; i < yNew.length; i++) {
      scratch[i] = yNew[i] < floor ? floor - yNew[i] : 0;
      any ||= yNew[i] < floor;
    }
    return any ? errorNorm(scratch, y, yNew, this.tolerances) / UNDERSHOOT_FRACTION : 0;
  }

  /** Step size and order together (Shampine & Reichelt §2.3): the order whose error allows the longest step. */
  next(h: number, error: number, accepted: boolean): number {
    if (this.newtonFailed) {
      this.newtonFailed = false;
      return h * NEWTON_FAILURE_SHRINK;
    }
    const k = this.currentOrder;
    // Fewer Newton iterations leave more room: the safety factor of Shampine & Reichelt's code.
    const safety = (0.9 * (2 * NEWTON_MAX_ITERATIONS + 1)) / (2 * NEWTON_MAX_ITERATIONS + this.iterations);
    if (!accepted) return h * Math.max(MIN_FACTOR, safety * Math.pow(error, -1 / (k + 1)));
    this.nextOrder = k;
    // The differences must span k + 1 equal steps before they say anything about other orders.
    if (this.equalSteps + 1 < k + 1) return h;
    const { differences: D, correction, scratch } = this;
    let best = Math.pow(error, -1 / (k + 1));
    let order = k;
    if (k > 1) {
      // D[k] after this step, times the error constant of order k − 1.
      for (let i = 0; i < scratch.length; i++) scratch[i] = ERROR_CONSTANT[k - 1] * (D[k][i] + correction[i]);
      const lower = Math.pow(errorNorm(scratch, this.yNew, this.yNew, this.tolerances), -1 / k);
      if (lower > best) [best, order] = [lower, k - 1];
    }
    if (k < this.maxOrder) {
      // D[k + 2] after this step: the next difference up.
      for (let i = 0; i < scratch.length; i++) scratch[i] = ERROR_CONSTANT[k + 1] * (correction[i] - D[k + 1][i]);
      const higher = Math.pow(errorNorm(scratch, this.yNew, this.yNew, this.tolerances), -1 / (k + 2));
      if (higher > best) [best, order] = [higher, k + 1];
    }
    const factor = Math.min(MAX_GROWTH, safety * best);
    if (order === k && factor >= 1 && factor < MIN_GROWTH) return h;
    this.nextOrder = order;
    return h * factor;
  }

  accept(): void {
    const { differences: D, correction } = this;
    const k = this.currentOrder;
    const n = correction.length;
    for (let i = 0; i < n; i++) D[k + 2][i] = correction[i] - D[k + 1][i];
    D[k + 1].set(correction);
    for (let j = k; j >= 0; j--) {
      const dj = D[j];
      const above = D[j + 1];
      for (let i = 0; i < n; i++) dj[i] += above[i];
    }
    for (let j = 0; j <= k; j++) this.interpolant[j].set(D[j]);
    this.interpolantOrder = k;
    this.equalSteps++;
    if (this.nextOrder !== k) {
      this.currentOrder = this.nextOrder;
      this.equalSteps = 0;
    }
    this.jacobianFresh = false;
  }

  /** The interpolating polynomial through the last k + 1 points, at t_n + (θ − 1)·h. */
  interpolate(theta: number, out: Float64Array): void {
    const x = theta - 1;
    out.set(this.interpolant[0]);
    let weight = 1;
    for (let j = 1; j <= this.interpolantOrder; j++) {
      weight *= (x + j - 1) / j;
      const dj = this.interpolant[j];
      for (let i = 0; i < out.length; i++) out[i] += weight * dj[i];
    }
  }

  invalidate(): void {
    this.stateChanged = true;
  }

  /**
   * Starts at order k from the solution at k + 1 equally spaced times, newest first, h apart
   * (a restart from a known past, and how the fixed-step convergence test reaches full order).
   */
  seed(points: readonly Float64Array[], h: number): void {
    const k = points.length - 1;
    if (k < 1 || k > this.maxOrder) throw new Error(`Bdf.seed needs 2 to ${this.maxOrder + 1} points`);
    const D = this.differences;
    for (const d of D) d.fill(0);
    // D[j] = ∇ʲy_n, built in place from the points: after pass j, D[j] holds ∇ʲ at the newest time.
    const column = new Float64Array(k + 1);
    for (let i = 0; i < D[0].length; i++) {
      points.forEach((point, m) => (column[m] = point[i]));
      for (let j = 0; j <= k; j++) {
        D[j][i] = column[0];
        for (let m = 0; m < k - j; m++) column[m] -= column[m + 1];
      }
    }
    this.historyH = h;
    this.currentOrder = this.nextOrder = k;
    this.equalSteps = k;
    this.stateChanged = false;
    this.evaluateJacobian(points[0]);
  }

  /** Order 1 from y alone: D[1] = h·f(y). */
  private restart(y: Float64Array, h: number): void {
    for (const d of this.differences) d.fill(0);
    this.differences[0].set(y);
    this.system.rhs(y, this.f);
    for (let i = 0; i < y.length; i++) this.differences[1][i] = h * this.f[i];
    this.historyH = h;
    this.currentOrder = this.nextOrder = 1;
    this.equalSteps = 0;
    this.evaluateJacobian(y);
  }

  /**
   * The state was changed from outside. A change within the tolerances (round-off below 0 clipped;
   * larger undershoots are rejected, see `undershoot`) keeps the history; anything larger is a new
   * problem and starts over at order 1.
   */
  private adopt(y: Float64Array, h: number): void {
    const { scratch, differences: D } = this;
    for (let i = 0; i < y.length; i++) scratch[i] = y[i] - D[0][i];
    if (errorNorm(scratch, y, D[0], this.tolerances) <= 1) D[0].set(y);
    else this.restart(y, h);
  }

  /** Re-scales D[0 … k] from step historyH to step h: D ← (R·U)ᵀ·D (Shampine & Reichelt eq. 2.7). */
  private rescale(ratio: number, h: number): void {
    const k = this.currentOrder;
    const { rescaling: RU, ratioMatrix: R } = this;
    differenceMatrix(ratio, R);
    for (let m = 0; m <= k; m++) {
      for (let j = 0; j <= k; j++) {
        let sum = 0;
        for (let l = 0; l <= k; l++) sum += R[m * SIZE + l] * UNIT_RATIO_MATRIX[l * SIZE + j];
        RU[m * SIZE + j] = sum;
      }
    }
    const D = this.differences;
    const column = this.column;
    for (let i = 0; i < D[0].length; i++) {
      for (let m = 0; m <= k; m++) column[m] = D[m][i];
      for (let j = 0; j <= k; j++) {
        let sum = 0;
        for (let m = 0; m <= k; m++) sum += RU[m * SIZE + j] * column[m];
        D[j][i] = sum;
      }
    }
    this.historyH = h;
    this.equalSteps = 0;
  }

  private predict(): void {
    const { differences: D, predicted, psi } = this;
    const k = this.currentOrder;
    const alpha = ALPHA[k];
    predicted.set(D[0]);
    psi.fill(0);
    for (let j = 1; j <= k; j++) {
      const dj = D[j];
      const weight = GAMMA[j] / alpha;
      for (let i = 0; i < psi.length; i++) {
        predicted[i] += dj[i];
        psi[i] += weight * dj[i];
      }
    }
  }

  /** Modified Newton on the corrector with convergence-rate tests; leaves y in yNew. */
  private correct(c: number): boolean {
    if (this.factoredC === 0 || Math.abs(c / this.factoredC - 1) > LU_REUSE_RATIO) {
      if (!this.lu.factor(1 / c, this.jacobian)) return false;
      this.factoredC = c;
      this.rate = INITIAL_RATE;
    }
    const { system, yNew: y, f, increment, correction, psi, predicted, newtonTolerance: tolerance } = this;
    const n = y.length;
    const cLu = this.factoredC;
    // (1/c_LU − J)·x = r/c_LU gives x = (I − c_LU·J)⁻¹·r; the factor 2/(1 + c/c_LU) of the
    // Byrne–Hindmarsh codes makes up for the stale c on the stiff components.
    const damping = 2 / (1 + c / cLu);
    y.set(predicted);
    correction.fill(0);
    let previousNorm = 0;
    for (let iteration = 0; iteration < NEWTON_MAX_ITERATIONS; iteration++) {
      system.rhs(y, f);
      for (let i = 0; i < n; i++) increment[i] = (c * f[i] - psi[i] - correction[i]) / cLu;
      this.lu.solve(increment);
      if (damping !== 1) for (let i = 0; i < n; i++) increment[i] *= damping;
      const norm = errorNorm(increment, predicted, predicted, this.tolerances);
      if (!Number.isFinite(norm)) return false;
      let rate = this.rate;
      if (iteration > 0) {
        const observed = norm / previousNorm;
        if (observed >= 1 || (Math.pow(observed, NEWTON_MAX_ITERATIONS - iteration) / (1 - observed)) * norm > tolerance) return false;
        rate = this.rate = Math.max(0.2 * this.rate, observed);
      }
      for (let i = 0; i < n; i++) {
        y[i] += increment[i];
        correction[i] += increment[i];
      }
      if (norm === 0 || (rate < 1 && (rate / (1 - rate)) * norm < tolerance)) {
        this.iterations = iteration + 1;
        return true;
      }
      previousNorm = norm;
    }
    return false;
  }

  private evaluateJacobian(y: Float64Array): void {
    this.system.jacobian(y, this.jacobian);
    this.jacobians++;
    this.jacobianFresh = true;
    this.factoredC = 0;
  }
}

/**
 * Shampine & Reichelt's R(ρ), R[i][j] = Π_{m=1..i} (m − 1 − ρ·j)/m with R[0][j] = 1, into `out`
 * (row-major, SIZE wide). Its entries do not depend on the order, which only truncates it.
 */
function differenceMatrix(ratio: number, out: Float64Array): Float64Array {
  for (let j = 0; j < SIZE; j++) out[j] = 1;
  for (let i = 1; i < SIZE; i++) for (let j = 0; j < SIZE; j++) out[i * SIZE + j] = (out[(i - 1) * SIZE + j] * (i - 1 - ratio * j)) / i;
  return out;
}
