// Equilibria followed in one parameter by pseudo-arclength continuation (Keller 1977; Allgower &
// Georg, "Introduction to Numerical Continuation Methods", ch. 2), in the compatibility class of
// the initial state: the unknowns are the state y and the parameter p, the equations the class
// residual G(y, p) (f with the laws in the led rows, as in equilibrium.ts) and one more that puts
// each new point on the hyperplane orthogonal to the branch's tangent a step ahead. Following the
// arclength instead of p goes round folds, where p turns back.
//
// Along the branch two test functions change sign between points, and the sign change is refined
// by bisection along the arc (each trial corrected back onto the branch):
// - fold: det A, A the Jacobian restricted to the stoichiometric subspace (one real eigenvalue
//   through 0); it is called a fold only where p turns too, otherwise a branch crosses;
// - Hopf: the bialternate product's determinant Π_{i<j}(λᵢ + λⱼ) (Guckenheimer, Myers & Sturmfels
//   1997): zero when a complex pair λ, λ̄ has λ + λ̄ = 0; a zero with a real pair λ = −μ (a neutral
//   saddle) is not a Hopf point and is not reported.
// Stability of each point comes from the real parts of A's eigenvalues.

import type { Mechanism } from "~/chem/model";
import { MAX_CONTINUATION_POINTS } from "~/chem/limits";
import { buildNetwork } from "~/chem/network";
import type { ContinuationTarget } from "~/shared/job-schemas";
import { stoichiometricMatrix, stoichiometricSubspace } from "./conservation";
import { DenseLu } from "./dense-lu";
import {
  classEigenvalues,
  classJacobian,
  classProblem,
  classResidual,
  networkEquilibrium,
  verdict,
  type ClassProblem,
  type Eigenvalue,
} from "./equilibrium";
import { SimulationCancelled, SimulationInputError } from "./errors";
import { networkSpec } from "./from-network";
import { compileKineticSystem } from "./kinetic-system";
import { variedMechanism } from "./sweep";

export interface ContinuationOptions {
  target: ContinuationTarget;
  from: number;
  to: number;
  /** Most points on the branch (default 400). */
  maxPoints?: number;
  signal?: AbortSignal;
  onProgress?: (fraction: number) => void;
}

export interface ContinuationPoint {
  value: number;
  state: Record<string, number>;
  /** null where linearisation cannot decide (an eigenvalue on the imaginary axis) or failed. */
  stable: boolean | null;
}

export interface Bifurcation {
  kind: "fold" | "hopf";
  value: number;
  state: Record<string, number>;
  /** For a Hopf point: the imaginary part ω of the critical pair, so the period born there is 2π/ω. */
  frequency?: number;
}

export interface ContinuationResult {
  points: ContinuationPoint[];
  bifurcations: Bifurcation[];
  /** Why the branch ends: it left the range, the point budget ran out, or no step could be corrected. */
  ended: "range" | "budget" | "stalled";
  summary: string;
}

const DEFAULT_POINTS = 400;
/** Steps along the scaled arc (state over its typical size, parameter over the range's width). */
const FIRST_STEP = 0.01;
const LARGEST_STEP = 0.05;
const SMALLEST_STEP = 1e-7;
const CORRECTOR_ITERATIONS = 8;
const BISECTIONS = 48;

/** A point of the branch: state and parameter as one vector u = (y, p), and A's eigenvalues there. */
interface BranchPoint {
  u: Float64Array;
  eigenvalues: Eigenvalue[] | null;
}

export function continueEquilibria(mechanism: Mechanism, options: ContinuationOptions): ContinuationResult {
  const { from, to } = options;
  if (!(Number.isFinite(from) && Number.isFinite(to) && from >= 0 && to >= 0 && from !== to)) {
    throw new SimulationInputError("the continuation range must be two different non-negative numbers");
  }
  const maxPoints = options.maxPoints ?? DEFAULT_POINTS;
  if (!(Number.isInteger(maxPoints) && maxPoints >= 2 && maxPoints <= MAX_CONTINUATION_POINTS)) {
    throw new SimulationInputError(`a continuation takes from 2 to ${MAX_CONTINUATION_POINTS} points`);
  }
  const branch = new Branch(mechanism, options.target, from, to);
  const start = branch.startingPoint();
  const points: BranchPoint[] = [start];
  const bifurcations: Bifurcation[] = [];
  const first = branch.tangent(start.u, null, Math.sign(to - from));
  if (!first) throw new SimulationInputError(`the equilibrium at the start of the range (${from}) is degenerate: no direction of the branch through it can be told; start a little further along`);
  let tangent: Float64Array = first;
  let step = FIRST_STEP;
  let ended: ContinuationResult["ended"] = "budget";

  while (points.length < maxPoints) {
    if (options.signal?.aborted) throw new SimulationCancelled();
    const last = points[points.length - 1];
    const next = branch.corrected(last.u, tangent, step);
    const nextTangent: Float64Array | null = next && branch.tangent(next, tangent, 0);
    // A step is refused when the corrector fails, the state leaves the orthant, or the branch
    // turns sharply within it (a step that may have jumped to another branch).
    if (!next || !nextTangent || branch.weightedDot(tangent, nextTangent) < 0.9) {
      step /= 2;
      if (step < SMALLEST_STEP) {
        ended = "stalled";
        break;
      }
      continue;
    }
    const point = branch.describe(next);
    const beyond = branch.outsideRange(next);
    if (beyond) {
      points.push(branch.describe(branch.atEnd(next, beyond)));
      ended = "range";
      bifurcations.push(...branch.located(last, tangent, step, point, nextTangent).filter((b) => branch.inRange(b.value)));
      break;
    }
    bifurcations.push(...branch.located(last, tangent, step, point, nextTangent));
    points.push(point);
    tangent = branch.rescaled(next, nextTangent);
    step = Math.min(step * 1.5, LARGEST_STEP);
    options.onProgress?.(branch.progress(next));
  }

  const shown = points.map((point) => branch.shown(point));
  return { points: shown, bifurcations, ended, summary: summary(shown, bifurcations, ended) };
}

/** The continuation problem at every value of the target: systems, residual, derivatives, tests. */
class Branch {
  private readonly at: (value: number) => Mechanism;
  private readonly names: string[];
  private readonly subspace: number[][];
  private readonly n: number;
  /** Scales of the state and of the parameter for the arclength's inner product. */
  private readonly weights: Float64Array;
  private readonly low: number;
  private readonly high: number;
  private cache = new Map<number, ClassProblem>();
  private covered = 0;

  constructor(
    mechanism: Mechanism,
    target: ContinuationOptions["target"],
    private readonly from: number,
    private readonly to: number,
  ) {
    this.at = variedMechanism(target, mechanism);
    const spec = networkSpec(this.at(from), buildNetwork(this.at(from)));
    this.names = spec.names;
    this.n = spec.names.length;
    this.subspace = stoichiometricSubspace(stoichiometricMatrix(spec));
    if (this.subspace.length === 0) throw new SimulationInputError("nothing changes in this mechanism: there is no branch of equilibria to follow");
    this.low = Math.min(from, to);
    this.high = Math.max(from, to);
    this.weights = new Float64Array(this.n + 1);
  }

  /** The equilibrium at the range's start that the branch grows from: the first one found there. */
  startingPoint(): BranchPoint {
    const mechanism = this.at(this.from);
    const found = networkEquilibrium(mechanism, buildNetwork(mechanism));
    const first = found.equilibria.find((e) => e.positive) ?? found.equilibria[0];
    if (!first) throw new SimulationInputError(`no equilibrium was found at the start of the range (${this.from}), so there is no branch to follow`);
    const u = Float64Array.from([...this.names.map((name) => first.state[name]), this.from]);
    const size = Math.max(...this.names.map((name) => Math.abs(first.state[name]))) || 1;
    this.weights.fill(size);
    this.weights[this.n] = this.high - this.low;
    return this.describe(u);
  }

  /** The class problem at parameter value p, compiled once per value. */
  private problem(p: number): ClassProblem {
    let problem = this.cache.get(p);
    if (!problem) {
      const mechanism = this.at(p);
      const spec = networkSpec(mechanism, buildNetwork(mechanism));
      if (spec.names.join("\n") !== this.names.join("\n")) throw new SimulationInputError(`the species change along the range (at ${p}): the branch cannot be followed there`);
      const system = compileKineticSystem(spec, { generate: false });
      problem = classProblem(system, stoichiometricMatrix(spec), [system.initial]);
      // The corrector asks for a handful of values at a time; older ones are not asked for again.
      if (this.cache.size > 8) this.cache.delete(this.cache.keys().next().value as number);
      this.cache.set(p, problem);
    }
    return problem;
  }

  /** G(y, p) into `out`. */
  private residual(u: Float64Array, out: Float64Array): void {
    classResidual(this.problem(u[this.n]), u.subarray(0, this.n), out);
  }

  /**
   * The n × (n + 1) Jacobian [G_y | G_p] and one more row `last`, as a square matrix in `lu`;
   * G_p by a forward difference (a parameter can enter the mechanism anywhere).
   */
  private extendedMatrix(u: Float64Array, last: Float64Array, lu: DenseLu): void {
    const { n } = this;
    const m = n + 1;
    const y = u.subarray(0, n);
    const gy = new Float64Array(n * n);
    classJacobian(this.problem(u[n]), y, gy);
    const h = Math.sqrt(Number.EPSILON) * Math.max(Math.abs(u[n]), this.weights[n] * 1e-3);
    const base = new Float64Array(n);
    const shifted = new Float64Array(n);
    classResidual(this.problem(u[n]), y, base);
    classResidual(this.problem(u[n] + h), y, shifted);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) lu.lu[i * m + j] = gy[i * n + j];
      lu.lu[i * m + n] = (shifted[i] - base[i]) / h;
    }
    for (let j = 0; j < m; j++) lu.lu[n * m + j] = last[j];
  }

  weightedDot(a: Float64Array, b: Float64Array): number {
    let sum = 0;
    for (let i = 0; i < a.length; i++) sum += (a[i] * b[i]) / this.weights[i] ** 2;
    return sum;
  }

  /**
   * The unit tangent at u (in the weighted norm): the null vector of [G_y | G_p], found as the
   * solution of [G_y | G_p; previous] t = e_last, so it keeps the previous one's direction; at the
   * start (no previous) the parameter's direction is `direction`.
   */
  tangent(u: Float64Array, previous: Float64Array | null, direction: number): Float64Array | null {
    const m = this.n + 1;
    const lu = new DenseLu(m);
    const last = new Float64Array(m);
    if (previous) for (let i = 0; i < m; i++) last[i] = previous[i] / this.weights[i] ** 2;
    else last[this.n] = 1;
    this.extendedMatrix(u, last, lu);
    if (!lu.factor()) return null;
    const t = new Float64Array(m);
    t[this.n] = 1;
    lu.solve(t);
    const size = Math.sqrt(this.weightedDot(t, t));
    if (!Number.isFinite(size) || size === 0) return null;
    const sign = previous ? 1 : Math.sign(t[this.n] * direction) || 1;
    return t.map((x) => (sign * x) / size);
  }

  /** The predictor u + s·t corrected by Newton's method on the hyperplane through it orthogonal to t; null if that fails. */
  corrected(u: Float64Array, t: Float64Array, s: number): Float64Array | null {
    const m = this.n + 1;
    const predicted = u.map((x, i) => x + s * t[i]);
    const row = t.map((x, i) => x / this.weights[i] ** 2);
    const v = Float64Array.from(predicted);
    const lu = new DenseLu(m);
    const g = new Float64Array(this.n);
    for (let iteration = 0; iteration < CORRECTOR_ITERATIONS; iteration++) {
      this.extendedMatrix(v, row, lu);
      if (!lu.factor()) return null;
      this.residual(v, g);
      const step = new Float64Array(m);
      for (let i = 0; i < this.n; i++) step[i] = -g[i];
      let along = 0;
      for (let i = 0; i < m; i++) along += row[i] * (v[i] - predicted[i]);
      step[this.n] = -along;
      lu.solve(step);
      let size = 0;
      for (let i = 0; i < m; i++) {
        v[i] += step[i];
        size = Math.max(size, Math.abs(step[i]) / this.weights[i]);
      }
      if (!v.every(Number.isFinite)) return null;
      if (size < 1e-11) return this.admissible(v) ? v : null;
    }
    return null;
  }

  /** Concentrations stay non-negative (to rounding) and the parameter too. */
  private admissible(u: Float64Array): boolean {
    for (let i = 0; i < this.n; i++) if (u[i] < -1e-9 * this.weights[i]) return false;
    return u[this.n] >= 0;
  }

  /** The branch point with its eigenvalues. */
  describe(u: Float64Array): BranchPoint {
    const problem = this.problem(u[this.n]);
    const y = u.subarray(0, this.n);
    problem.system.jacobian(y, problem.jacobian);
    return { u, eigenvalues: classEigenvalues(problem.jacobian, this.n, this.subspace) };
  }

  /** Past which end of the range u lies, if it does. */
  outsideRange(u: Float64Array): number | null {
    const p = u[this.n];
    return p > this.high ? this.high : p < this.low ? this.low : null;
  }

  inRange(value: number): boolean {
    return value >= this.low && value <= this.high;
  }

  /** The equilibrium at the end value, by Newton's method in y alone from u (p fixed). */
  atEnd(u: Float64Array, end: number): Float64Array {
    const fixed = new Float64Array(this.n + 1);
    fixed[this.n] = 1;
    const v = Float64Array.from(u);
    v[this.n] = end;
    const onEnd = this.corrected(v, fixed, 0);
    return onEnd ?? v;
  }

  /** The share of the range covered so far: it never falls back, though the branch may turn. */
  progress(u: Float64Array): number {
    this.covered = Math.max(this.covered, Math.min(1, Math.abs(u[this.n] - this.from) / (this.high - this.low)));
    return this.covered;
  }

  /**
   * The state's scale grows with the branch (it is never smaller than at the start), so that a
   * branch whose concentrations grow tenfold is not walked in steps ten times too short; the
   * tangent is renormalised in the new scale.
   */
  rescaled(u: Float64Array, t: Float64Array): Float64Array {
    const size = Math.max(...Array.from(u.subarray(0, this.n), Math.abs));
    if (size > this.weights[0]) this.weights.fill(size, 0, this.n);
    const length = Math.sqrt(this.weightedDot(t, t));
    return t.map((x) => x / length);
  }

  /** Folds and Hopf points between two consecutive points, each refined by bisection along the arc. */
  located(before: BranchPoint, t: Float64Array, s: number, after: BranchPoint, tangentAfter: Float64Array): Bifurcation[] {
    if (!before.eigenvalues || !after.eigenvalues) return [];
    const found: Bifurcation[] = [];
    const turned = Math.sign(t[this.n]) !== Math.sign(tangentAfter[this.n]);
    if (turned && foldTest(before.eigenvalues) * foldTest(after.eigenvalues) < 0) {
      const point = this.bisected(before.u, t, s, foldTest);
      if (point) found.push({ kind: "fold", value: point.u[this.n], state: this.stateOf(point.u) });
    }
    if (hopfTest(before.eigenvalues) * hopfTest(after.eigenvalues) < 0) {
      const point = this.bisected(before.u, t, s, hopfTest);
      const pair = point?.eigenvalues && criticalPair(point.eigenvalues);
      if (point && pair) found.push({ kind: "hopf", value: point.u[this.n], state: this.stateOf(point.u), frequency: Math.abs(pair.im) });
    }
    return found;
  }

  /** The point between arclength 0 and s from u where `test` changes sign. */
  private bisected(u: Float64Array, t: Float64Array, s: number, test: (eigenvalues: Eigenvalue[]) => number): BranchPoint | null {
    const signAt0 = test(this.describe(u).eigenvalues ?? []);
    let [low, high] = [0, s];
    let best: BranchPoint | null = null;
    for (let i = 0; i < BISECTIONS && high - low > 1e-13 * s; i++) {
      const middle = (low + high) / 2;
      const v = this.corrected(u, t, middle);
      if (!v) return best;
      best = this.describe(v);
      if (!best.eigenvalues) return null;
      if (test(best.eigenvalues) * signAt0 > 0) low = middle;
      else high = middle;
    }
    return best;
  }

  stateOf(u: Float64Array): Record<string, number> {
    const state: Record<string, number> = {};
    this.names.forEach((name, i) => (state[name] = u[i]));
    return state;
  }

  shown(point: BranchPoint): ContinuationPoint {
    const stability = point.eigenvalues ? verdict(point.eigenvalues) : null;
    return { value: point.u[this.n], state: this.stateOf(point.u), stable: stability === "stable" ? true : stability === "unstable" ? false : null };
  }
}

/** The sign of det A = Π λ. */
export function foldTest(eigenvalues: Eigenvalue[]): number {
  return signOfProduct(eigenvalues);
}

/** The sign of Π_{i<j}(λᵢ + λⱼ): the determinant of the bialternate product 2A ⊙ I. */
export function hopfTest(eigenvalues: Eigenvalue[]): number {
  const sums: Eigenvalue[] = [];
  eigenvalues.forEach((a, i) => eigenvalues.slice(i + 1).forEach((b) => sums.push({ re: a.re + b.re, im: a.im + b.im })));
  return signOfProduct(sums);
}

/**
 * The sign of the real part of a product of complex numbers closed under conjugation (so the
 * product is real). Each factor is divided by its modulus first, so that no product of many
 * factors overflows, and a real factor that came back with a rounding-size imaginary part keeps
 * its sign.
 */
function signOfProduct(factors: Eigenvalue[]): number {
  let re = 1;
  let im = 0;
  for (const { re: a, im: b } of factors) {
    const size = Math.hypot(a, b);
    if (size === 0) return 0;
    [re, im] = [(re * a - im * b) / size, (re * b + im * a) / size];
  }
  return Math.sign(re);
}

/** The complex pair nearest the imaginary axis, if it is a pair (not two real eigenvalues). */
function criticalPair(eigenvalues: Eigenvalue[]): Eigenvalue | null {
  const size = Math.max(...eigenvalues.map((e) => Math.hypot(e.re, e.im)));
  const complex = eigenvalues.filter((e) => e.im > 1e-8 * size);
  if (complex.length === 0) return null;
  return complex.reduce((best, e) => (Math.abs(e.re) < Math.abs(best.re) ? e : best));
}

function summary(points: ContinuationPoint[], bifurcations: Bifurcation[], ended: ContinuationResult["ended"]): string {
  const folds = bifurcations.filter((b) => b.kind === "fold").length;
  const hopfs = bifurcations.length - folds;
  const found = bifurcations.length === 0 ? "no fold or Hopf point" : [folds && `${folds} fold${folds > 1 ? "s" : ""}`, hopfs && `${hopfs} Hopf point${hopfs > 1 ? "s" : ""}`].filter(Boolean).join(" and ");
  const end = { range: "to the end of the range", budget: "until the point budget ran out", stalled: "until no further step could be corrected (the branch may end on the boundary or turn too sharply)" }[ended];
  return `One branch of equilibria, followed from the start of the range ${end}: ${points.length} points, ${found}. Other branches not connected to it are not shown.`;
}
