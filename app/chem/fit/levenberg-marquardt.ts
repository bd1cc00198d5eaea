// Levenberg–Marquardt for min ½‖r(θ)‖² with box bounds, as in K. Madsen, H. B. Nielsen &
// O. Tingleff, "Methods for Non-Linear Least Squares Problems" (2nd ed., DTU 2004), Algorithm 3.16,
// with Marquardt's scaling: the damping adds μ·diag(JᵀJ), so the step does not depend on the
// parameters' units. Bounds are kept by projecting the trial point into the box; the gain ratio
// is measured with the projected step. The caller supplies residuals and their Jacobian together
// (the sensitivities come with the state at no extra integration).

import { SimulationCancelled } from "~/chem/kinetics/errors";

export interface Evaluation {
  residuals: Float64Array;
  /** Row-major m×P: ∂r_i/∂θ_j. */
  jacobian: Float64Array;
}

export interface LeastSquaresOptions {
  lower: Float64Array;
  upper: Float64Array;
  maxIterations: number;
  signal?: AbortSignal;
  /** Called at the start (iteration 0) and after each accepted step. */
  onIteration?: (iteration: number, cost: number) => void;
}

export interface LeastSquaresResult<E extends Evaluation> {
  theta: Float64Array;
  /** The caller's evaluation at the optimum, whatever else it carries. */
  evaluation: E;
  cost: number;
  iterations: number;
  converged: boolean;
  stopped: string;
}

/** Relative decrease of the cost, size of the step, size of the gradient: below these the search has converged. */
const COST_TOLERANCE = 1e-10;
const STEP_TOLERANCE = 1e-9;
const GRADIENT_TOLERANCE = 1e-10;
const INITIAL_DAMPING = 1e-3;

export function costOf(residuals: Float64Array): number {
  let sum = 0;
  for (const r of residuals) sum += r * r;
  return sum / 2;
}

/** JᵀJ and Jᵀr. */
export function normalEquations({ residuals, jacobian }: Evaluation, P: number): { A: Float64Array; g: Float64Array } {
  const m = residuals.length;
  const A = new Float64Array(P * P);
  const g = new Float64Array(P);
  for (let i = 0; i < m; i++) {
    const row = i * P;
    for (let a = 0; a < P; a++) {
      const ja = jacobian[row + a];
      if (ja === 0) continue;
      g[a] += ja * residuals[i];
      for (let b = a; b < P; b++) A[a * P + b] += ja * jacobian[row + b];
    }
  }
  for (let a = 0; a < P; a++) for (let b = 0; b < a; b++) A[a * P + b] = A[b * P + a];
  return { A, g };
}

/** Solves the symmetric positive definite M·x = b by Cholesky; null when M is not positive definite. */
export function choleskySolve(M: Float64Array, b: Float64Array): Float64Array | null {
  const P = b.length;
  const L = new Float64Array(P * P);
  for (let i = 0; i < P; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = M[i * P + j];
      for (let k = 0; k < j; k++) sum -= L[i * P + k] * L[j * P + k];
      if (i === j) {
        if (!(sum > 0)) return null;
        L[i * P + i] = Math.sqrt(sum);
      } else L[i * P + j] = sum / L[j * P + j];
    }
  }
  const x = Float64Array.from(b);
  for (let i = 0; i < P; i++) {
    for (let k = 0; k < i; k++) x[i] -= L[i * P + k] * x[k];
    x[i] /= L[i * P + i];
  }
  for (let i = P - 1; i >= 0; i--) {
    for (let k = i + 1; k < P; k++) x[i] -= L[k * P + i] * x[k];
    x[i] /= L[i * P + i];
  }
  return x;
}

export function levenbergMarquardt<E extends Evaluation>(evaluate: (theta: Float64Array) => E, start: Float64Array, options: LeastSquaresOptions): LeastSquaresResult<E> {
  const P = start.length;
  const { lower, upper } = options;
  let theta = start.map((value, j) => Math.min(upper[j], Math.max(lower[j], value)));
  let evaluation = evaluate(theta);
  let cost = costOf(evaluation.residuals);
  options.onIteration?.(0, cost);
  let { A, g } = normalEquations(evaluation, P);
  let mu = INITIAL_DAMPING;
  let nu = 2;
  const finish = (iterations: number, converged: boolean, stopped: string): LeastSquaresResult<E> => ({ theta, evaluation, cost, iterations, converged, stopped });

  for (let iteration = 1; iteration <= options.maxIterations; iteration++) {
    if (options.signal?.aborted) throw new SimulationCancelled();
    if (cost === 0) return finish(iteration - 1, true, "the model fits the data exactly");
    if (largestCosine(g, A, cost, theta, lower, upper) <= GRADIENT_TOLERANCE) return finish(iteration - 1, true, "the residuals are orthogonal to every direction the parameters can move");
    // Damped normal equations (JᵀJ + μ·diag(JᵀJ))·h = −g over the free parameters, retried with
    // more damping until the cost falls. A parameter on a bound that the gradient pushes outward
    // stays put (an active set), so the others are not dragged along by a step it cannot take.
    const free = Array.from({ length: P }, (_, j) => j).filter((j) => !pushedOut(g[j], theta[j], lower[j], upper[j]));
    for (;;) {
      const F = free.length;
      const M = new Float64Array(F * F);
      free.forEach((a, i) => free.forEach((b, k) => (M[i * F + k] = A[a * P + b])));
      for (let i = 0; i < F; i++) M[i * F + i] += mu * Math.max(M[i * F + i], 1e-300);
      const reduced = choleskySolve(M, Float64Array.from(free, (j) => -g[j]));
      const solved = reduced && new Float64Array(P);
      if (reduced && solved) free.forEach((j, i) => (solved[j] = reduced[i]));
      if (!solved) {
        mu *= nu;
        nu *= 2;
        if (!Number.isFinite(mu)) return finish(iteration, false, "the normal equations cannot be solved");
        continue;
      }
      const trial = theta.map((value, j) => Math.min(upper[j], Math.max(lower[j], value + solved[j])));
      const step = trial.map((value, j) => value - theta[j]);
      const stepSize = Math.hypot(...step);
      if (stepSize <= STEP_TOLERANCE * (Math.hypot(...theta) + STEP_TOLERANCE)) return finish(iteration - 1, true, "the step became negligible");
      // Predicted decrease of the linear model: −hᵀg − ½hᵀAh.
      let predicted = 0;
      for (let a = 0; a < P; a++) {
        let Ah = 0;
        for (let b = 0; b < P; b++) Ah += A[a * P + b] * step[b];
        predicted -= step[a] * (g[a] + Ah / 2);
      }
      let candidate: E | null = null;
      try {
        candidate = evaluate(trial);
      } catch (error) {
        if (error instanceof SimulationCancelled) throw error;
        candidate = null; // an integration that fails at the trial point: treat as a rejected step
      }
      const trialCost = candidate ? costOf(candidate.residuals) : Number.POSITIVE_INFINITY;
      const rho = predicted > 0 ? (cost - trialCost) / predicted : -1;
      if (candidate && Number.isFinite(trialCost) && rho > 0) {
        const decrease = cost - trialCost;
        theta = trial;
        evaluation = candidate;
        cost = trialCost;
        ({ A, g } = normalEquations(evaluation, P));
        mu *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
        nu = 2;
        options.onIteration?.(iteration, cost);
        if (decrease <= COST_TOLERANCE * cost) return finish(iteration, true, "the cost stopped decreasing");
        break;
      }
      mu *= nu;
      nu *= 2;
      if (mu > 1e16) return finish(iteration, true, "no step lowers the cost further");
    }
  }
  return finish(options.maxIterations, false, `stopped after ${options.maxIterations} iterations without converging`);
}

/**
 * The largest |cos| of the angle between the residuals and a Jacobian column (MINPACK's gradient
 * test, free of the residuals' units), over parameters free to move downhill: one on a bound that
 * the gradient pushes outward does not count.
 */
function largestCosine(g: Float64Array, A: Float64Array, cost: number, theta: Float64Array, lower: Float64Array, upper: Float64Array): number {
  const P = g.length;
  const residualNorm = Math.sqrt(2 * cost);
  let largest = 0;
  for (let j = 0; j < P; j++) {
    const blocked = pushedOut(g[j], theta[j], lower[j], upper[j]);
    const columnNorm = Math.sqrt(A[j * P + j]);
    if (!blocked && columnNorm > 0) largest = Math.max(largest, Math.abs(g[j]) / (residualNorm * columnNorm));
  }
  return largest;
}

/** On a bound, with the descent direction −g pointing out of the box. */
function pushedOut(gradient: number, value: number, low: number, high: number): boolean {
  return (value <= low && gradient > 0) || (value >= high && gradient < 0);
}
