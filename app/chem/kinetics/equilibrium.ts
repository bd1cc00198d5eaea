// Equilibria and their stability, searched for in the compatibility class of the initial state.
// Damped Newton's method on that class: the equations of the variables each conservation law leads
// are redundant (they follow from the others), so they are replaced by the laws themselves, with
// totals taken from the initial state. A network can have several equilibria in one class, so the
// search starts from several points — the given state, the end of a short simulation, and seeded
// random positive points of the class — and deflates every root it has found (Farrell, Birkisson &
// Funke, "Deflation techniques for finding distinct solutions of nonlinear partial differential
// equations", SIAM J. Sci. Comput. 37 (2015) A2026), so that Newton's method is pushed away from
// it and the same start can lead to another. Stability comes from the eigenvalues of the Jacobian
// restricted to the stoichiometric subspace — the conservation laws' zero eigenvalues say nothing
// about stability within a class.

import { eigs } from "mathjs";
import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { seededRandom } from "~/chem/seeded-random";
import { conservationBasis, stoichiometricMatrix, stoichiometricSubspace } from "./conservation";
import { DenseLu } from "./dense-lu";
import { IntegrationFailure } from "./errors";
import { networkSpec } from "./from-network";
import { polynomialSpec } from "./from-polynomial";
import { compileKineticSystem, type KineticSpec } from "./kinetic-system";
import type { OdeSystem } from "./ode-system";
import { simulateSystem } from "./simulate";

export type Stability = "stable" | "unstable" | "undecided";

export interface Eigenvalue {
  re: number;
  im: number;
}

/** Where the Newton run that found an equilibrium began. */
export type StartKind = "given" | "settled" | "initial" | "random";

export interface Equilibrium {
  state: Record<string, number>;
  /** max |f(y)| at the state. */
  residual: number;
  /** Every variable is positive (not on the boundary of the orthant). */
  positive: boolean;
  /** Eigenvalues of the Jacobian within the compatibility class. */
  eigenvalues: Eigenvalue[];
  stability: Stability | null;
  summary: string;
  foundFrom: StartKind;
}

/**
 * The top-level fields describe the first equilibrium found (from the given start, else from the
 * settled state, the initial state or a random start), as before several were searched for;
 * `equilibria` lists every distinct one.
 */
export interface EquilibriumResult {
  converged: boolean;
  state: Record<string, number>;
  residual: number;
  iterations: number;
  positive: boolean;
  eigenvalues: Eigenvalue[];
  stability: Stability | null;
  summary: string;
  equilibria: Equilibrium[];
  /** Dimension of the stoichiometric subspace: the class is this many-dimensional. */
  classDimension: number;
  /** How many starting points Newton's method was run from. */
  starts: number;
}

export interface EquilibriumOptions {
  /** A starting point tried first; the end of a simulation to `settleTime` and the initial state follow. */
  start?: ArrayLike<number>;
  settleTime?: number;
  maxIterations?: number;
  /** Random starts in the class (default 12; fewer for large systems, where each costs more). */
  randomStarts?: number;
  seed?: number;
}

export function networkEquilibrium(mechanism: Mechanism, network: Network, options: EquilibriumOptions = {}): EquilibriumResult {
  return specEquilibrium(networkSpec(mechanism, network), options);
}

export function polynomialEquilibrium(ode: PolynomialOde, options: EquilibriumOptions = {}): EquilibriumResult {
  return specEquilibrium(polynomialSpec(ode), options);
}

/** A settling run longer than this many steps is abandoned: it is one start among several. */
const SETTLE_STEPS = 20_000;
/** Newton's method is rerun from a start that found a new root, at most this often. */
const RERUNS_PER_START = 4;
const MAX_EQUILIBRIA = 16;
const DEFAULT_SEED = 0x5eed;

function specEquilibrium(spec: KineticSpec, options: EquilibriumOptions): EquilibriumResult {
  const system = compileKineticSystem(spec);
  const maxIterations = options.maxIterations ?? 100;
  const given = options.start ? Float64Array.from(options.start) : null;
  const settled = settle(system, options.settleTime ?? 100);
  const problem = classProblem(system, stoichiometricMatrix(spec), [system.initial, given, settled]);
  const starts: { kind: StartKind; point: Float64Array }[] = [];
  if (given) starts.push({ kind: "given", point: given });
  if (settled) starts.push({ kind: "settled", point: settled });
  starts.push({ kind: "initial", point: Float64Array.from(system.initial) });
  // Each Newton iteration factors an n × n matrix: large systems get fewer starts and no reruns.
  const large = system.names.length > 150;
  const randomCount = options.randomStarts ?? (system.names.length <= 30 ? 12 : large ? 0 : 3);
  const interior = [settled, system.initial, given].find((point) => point && point.every((x) => x > 0)) ?? null;
  starts.push(...randomClassPoints(problem, interior, randomCount, options.seed ?? DEFAULT_SEED).map((point) => ({ kind: "random" as const, point })));

  const roots: { y: Float64Array; kind: StartKind; iterations: number }[] = [];
  let firstIterations: number | null = null;
  for (const { kind, point } of starts) {
    for (let run = 0; run <= (large ? 0 : RERUNS_PER_START) && roots.length < MAX_EQUILIBRIA; run++) {
      const outcome = deflatedNewton(problem, point, roots.map((root) => root.y), maxIterations, kind === "random" && system.nonNegative);
      firstIterations ??= outcome.iterations;
      const root = outcome.root;
      if (!root || roots.some((known) => sameState(known.y, root, problem.scale)) || onBoundaryContinuum(problem, root)) break;
      roots.push({ y: root, kind, iterations: outcome.iterations });
    }
  }

  const equilibria = roots.map(({ y, kind }) => describeRoot(problem, y, kind));
  const classDimension = problem.subspace.length;
  const first = equilibria[0];
  if (!first) {
    const y = starts[0].point;
    return {
      converged: false, state: stateOf(system, y), residual: rhsSize(system, y), iterations: firstIterations ?? 0, positive: false,
      eigenvalues: [], stability: null, equilibria, classDimension, starts: starts.length,
      summary: `No equilibrium was found: Newton's method did not converge from any of ${starts.length} starting points in the compatibility class. Try a longer settling run or another guess.`,
    };
  }
  const { foundFrom: _, ...firstFields } = first;
  return {
    ...firstFields, converged: true, iterations: roots[0].iterations, equilibria, classDimension, starts: starts.length,
    summary: equilibria.length === 1 ? first.summary : countSummary(equilibria, starts.length),
  };
}

function settle(system: OdeSystem, until: number): Float64Array | null {
  try {
    const run = simulateSystem(system, { until, samples: 2, maxSteps: SETTLE_STEPS });
    return Float64Array.from(system.names, (name) => run.series[name][1]);
  } catch (error) {
    if (error instanceof IntegrationFailure) return null;
    throw error;
  }
}

// ── Newton's method in the compatibility class ─────────────────────────────────────────────────
export interface ClassProblem {
  system: OdeSystem;
  laws: number[][];
  /** Law index by the variable whose equation it replaces. */
  replaced: Map<number, number>;
  /** Each law's value at the initial state: the totals the class fixes. */
  totals: number[];
  /** Orthonormal basis of the stoichiometric subspace. */
  subspace: number[][];
  /** A typical size of the variables, below which differences count as nothing. */
  scale: number;
  f: Float64Array;
  jacobian: Float64Array;
  lu: DenseLu;
}

export function classProblem(system: OdeSystem, stoichiometry: number[][], points: (ArrayLike<number> | null)[]): ClassProblem {
  const n = system.names.length;
  const { laws, leading } = conservationBasis(stoichiometry);
  const sizes = points.flatMap((point) => (point ? Array.from(point, Math.abs) : []));
  return {
    system,
    laws,
    replaced: new Map(leading.map((variable, l) => [variable, l])),
    totals: laws.map((law) => dot(law, system.initial)),
    subspace: stoichiometricSubspace(stoichiometry),
    scale: Math.max(0, ...sizes.filter(Number.isFinite)) || 1,
    f: new Float64Array(n),
    jacobian: new Float64Array(n * n),
    lu: new DenseLu(n),
  };
}

/**
 * f with the led variables' equations replaced by the laws; returns the Euclidean norm of `out`,
 * the measure every Newton step is a descent direction for.
 */
export function classResidual(p: ClassProblem, y: Float64Array, out: Float64Array): number {
  p.system.rhs(y, p.f);
  let squares = 0;
  for (let i = 0; i < y.length; i++) {
    const l = p.replaced.get(i);
    out[i] = l === undefined ? p.f[i] : dot(p.laws[l], y) - p.totals[l];
    squares += out[i] ** 2;
  }
  return Math.sqrt(squares);
}

/** The Jacobian of the class residual at y into `out` (row-major): f's rows, the laws in the led rows. */
export function classJacobian(p: ClassProblem, y: Float64Array, out: Float64Array): void {
  const n = y.length;
  p.system.jacobian(y, p.jacobian);
  out.set(p.jacobian);
  for (const [variable, l] of p.replaced) for (let j = 0; j < n; j++) out[variable * n + j] = p.laws[l][j];
}

/** The Newton step −J⁻¹g of the class residual g at y, or null where J is singular. */
function newtonStep(p: ClassProblem, y: Float64Array, g: Float64Array): Float64Array | null {
  classJacobian(p, y, p.lu.lu);
  if (!p.lu.factor()) return null;
  const step = Float64Array.from(g, (x) => -x);
  p.lu.solve(step);
  return step;
}

/**
 * Damped Newton's method on η(y)·g(y), where η grows without bound at every known root, so the
 * iteration cannot settle on one again. With η = Π_r (1/‖y − r‖² + 1) (Farrell et al.'s power 2
 * and shift 1, distances relative to each root's size), the deflated Newton step is the plain one
 * times 1/(1 − d·∇η/η).
 */
function deflatedNewton(
  p: ClassProblem,
  start: Float64Array,
  roots: Float64Array[],
  maxIterations: number,
  positiveOnly: boolean,
): { root: Float64Array | null; iterations: number } {
  const n = start.length;
  const { nonNegative } = p.system;
  let y = Float64Array.from(start, (x) => (nonNegative ? Math.max(x, 0) : x));
  let g = new Float64Array(n);
  let merit = deflation(p, roots, y, positiveOnly).eta * classResidual(p, y, g);
  for (let iterations = 1; iterations <= maxIterations; iterations++) {
    if (!Number.isFinite(merit)) break;
    const step = newtonStep(p, y, g);
    if (!step) break;
    // Near a simple root the Newton step is the distance to it: tiny means found.
    if (step.every((d, i) => Math.abs(d) <= 1e-10 * (Math.abs(y[i]) + 1e-6 * p.scale))) {
      return { root: Float64Array.from(y, (x, i) => (nonNegative ? Math.max(x + step[i], 0) : x + step[i])), iterations };
    }
    const { gradient } = deflation(p, roots, y, positiveOnly);
    const tau = 1 / (1 - dot(gradient, step));
    const scaled = Number.isFinite(tau) ? tau : 1;
    const trial = new Float64Array(n);
    const trialResidual = new Float64Array(n);
    let accepted = false;
    // Halve the step until the deflated residual falls. Concentrations move as Newton's method in
    // their logarithms would (y·exp(d/y) agrees with y + d to first order): they never turn
    // negative, and a step does not drop a search onto the boundary of the orthant at once.
    for (let lambda = 1; lambda > 1e-10 && !accepted; lambda /= 2) {
      for (let i = 0; i < n; i++) {
        const change = lambda * scaled * step[i];
        if (!nonNegative) trial[i] = y[i] + change;
        else trial[i] = y[i] > 0 ? y[i] * Math.exp(Math.min(change / y[i], 20)) : Math.max(change, 0);
      }
      const size = classResidual(p, trial, trialResidual);
      const trialMerit = deflation(p, roots, trial, positiveOnly).eta * size;
      if (trialMerit < (1 - 1e-4 * lambda) * merit || size === 0) {
        accepted = true;
        merit = trialMerit;
      }
    }
    if (!accepted) return { root: null, iterations };
    y = trial;
    g = trialResidual;
  }
  return { root: null, iterations: maxIterations };
}

/**
 * η(y) and ∇η/η for the known roots; for a search of positive equilibria also for the faces
 * y_i = 0 of the orthant, with a factor s/y_i + 1 each (power 1: a rate multiplied by a monomial
 * vanishes on a face to first order, and this undoes exactly that), so that Newton's method is not
 * drawn to a face where every point is at rest.
 */
function deflation(p: ClassProblem, roots: Float64Array[], y: Float64Array, positiveOnly: boolean): { eta: number; gradient: Float64Array } {
  const gradient = new Float64Array(y.length);
  let eta = 1;
  if (positiveOnly) {
    for (let i = 0; i < y.length; i++) {
      eta *= p.scale / y[i] + 1;
      gradient[i] -= p.scale / (y[i] * (p.scale + y[i]));
    }
  }
  for (const root of roots) {
    const weights = Array.from(root, (r) => Math.abs(r) + 1e-3 * p.scale);
    let distance = 0;
    for (let i = 0; i < y.length; i++) distance += ((y[i] - root[i]) / weights[i]) ** 2;
    eta *= 1 / distance + 1;
    // ∇m/m for m = 1/q + 1 is −∇q / (q (1 + q)), with ∇q = 2 (y − r) / w².
    for (let i = 0; i < y.length; i++) gradient[i] -= (2 * (y[i] - root[i])) / weights[i] ** 2 / (distance * (1 + distance));
  }
  return { eta, gradient };
}

/**
 * A root on the boundary of the orthant where the Jacobian in the class is singular: one point of
 * a continuum of boundary equilibria (a mechanism multiplied by a monomial is at rest wherever the
 * monomial vanishes), not worth reporting point by point.
 */
function onBoundaryContinuum(p: ClassProblem, y: Float64Array): boolean {
  if (!p.system.nonNegative || y.every((x) => x > 1e-12 * p.scale)) return false;
  p.system.jacobian(y, p.jacobian);
  const eigenvalues = classEigenvalues(p.jacobian, y.length, p.subspace);
  if (!eigenvalues || eigenvalues.length === 0) return false;
  const size = Math.max(...eigenvalues.map((e) => Math.hypot(e.re, e.im)));
  return eigenvalues.some((e) => Math.hypot(e.re, e.im) <= 1e-9 * size);
}

function sameState(a: Float64Array, b: Float64Array, scale: number): boolean {
  return a.every((x, i) => Math.abs(x - b[i]) <= 1e-6 * (Math.max(Math.abs(x), Math.abs(b[i])) + 1e-6 * scale));
}

// ── Starting points ────────────────────────────────────────────────────────────────────────────
/**
 * Seeded random positive points of the class: random positive vectors (uniform and log-uniform
 * in turn, up to twice the typical size) projected orthogonally onto the class's affine space;
 * a projection that leaves the orthant is pulled back towards a known interior point.
 */
function randomClassPoints(p: ClassProblem, interior: ArrayLike<number> | null, count: number, seed: number): Float64Array[] {
  const random = seededRandom(seed);
  const n = p.system.names.length;
  const k = p.laws.length;
  const gram = new DenseLu(k);
  p.laws.forEach((a, i) => p.laws.forEach((b, j) => (gram.lu[i * k + j] = dot(a, b))));
  if (k > 0 && !gram.factor()) return [];
  const points: Float64Array[] = [];
  for (let attempt = 0; attempt < 3 * count && points.length < count; attempt++) {
    const point = Float64Array.from({ length: n }, () => (attempt % 2 === 0 ? 2 * p.scale * random() : p.scale * 10 ** (-4 * random())));
    if (k > 0) {
      const excess = Float64Array.from(p.laws, (law, l) => dot(law, point) - p.totals[l]);
      gram.solve(excess);
      p.laws.forEach((law, l) => law.forEach((w, i) => (point[i] -= w * excess[l])));
    }
    if (point.every((x) => x > 0)) points.push(point);
    else if (interior) points.push(towardsInterior(point, interior));
  }
  return points;
}

/** The point 90% of the way from `interior` towards `point` that the orthant still allows. */
function towardsInterior(point: Float64Array, interior: ArrayLike<number>): Float64Array {
  let reach = 1;
  point.forEach((x, i) => {
    if (x <= 0) reach = Math.min(reach, interior[i] / (interior[i] - x));
  });
  return Float64Array.from(point, (x, i) => interior[i] + 0.9 * reach * (x - interior[i]));
}

// ── What was found ─────────────────────────────────────────────────────────────────────────────
function describeRoot(p: ClassProblem, y: Float64Array, foundFrom: StartKind): Equilibrium {
  const n = y.length;
  p.system.jacobian(y, p.jacobian);
  const eigenvalues = classEigenvalues(p.jacobian, n, p.subspace);
  const stability = eigenvalues === null ? null : verdict(eigenvalues);
  const positive = y.every((x) => x > 1e-12 * p.scale);
  return {
    state: stateOf(p.system, y), residual: rhsSize(p.system, y), positive, eigenvalues: eigenvalues ?? [], stability, foundFrom,
    summary: describe(eigenvalues, stability, positive, p.laws.length),
  };
}

function countSummary(equilibria: Equilibrium[], starts: number): string {
  const counts = (["stable", "unstable", "undecided"] as const)
    .map((kind) => [equilibria.filter((e) => e.stability === kind).length, kind] as const)
    .filter(([count]) => count > 0)
    .map(([count, kind]) => `${count} ${kind === "undecided" ? "undecided by linearisation" : kind}`);
  return `${equilibria.length} distinct equilibria were found in the compatibility class from ${starts} starting points (${counts.join(", ")}). A search from finitely many starts cannot rule out others.`;
}

function stateOf(system: OdeSystem, y: ArrayLike<number>): Record<string, number> {
  const state: Record<string, number> = {};
  system.names.forEach((name, i) => (state[name] = y[i]));
  return state;
}

function rhsSize(system: OdeSystem, y: Float64Array): number {
  const f = new Float64Array(y.length);
  system.rhs(y, f);
  return Math.max(0, ...Array.from(f, Math.abs));
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += a[i] * b[i];
  return sum;
}

/** Eigenvalues of Qᵀ J Q for an orthonormal basis Q of the stoichiometric subspace (J maps into it). */
export function classEigenvalues(jacobian: Float64Array, n: number, basis: number[][]): Eigenvalue[] | null {
  const r = basis.length;
  if (r === 0) return [];
  const reduced = basis.map((qa) =>
    basis.map((qb) => {
      let sum = 0;
      for (let i = 0; i < n; i++) {
        let row = 0;
        for (let j = 0; j < n; j++) row += jacobian[i * n + j] * qb[j];
        sum += qa[i] * row;
      }
      return sum;
    }),
  );
  // mathjs's iteration judges convergence in absolute terms and fails on entries of 10^5 (a
  // mechanism multiplied by a monomial), so it sees the matrix scaled to entries of at most 1.
  const size = Math.max(...reduced.flat().map(Math.abs)) || 1;
  try {
    const { values } = eigs(reduced.map((row) => row.map((x) => x / size)), { eigenvectors: false });
    return (values as unknown as (number | { re: number; im: number })[]).map((v) =>
      typeof v === "number" ? { re: v * size, im: 0 } : { re: v.re * size, im: v.im * size },
    );
  } catch {
    return null;
  }
}

export function verdict(eigenvalues: Eigenvalue[]): Stability {
  const size = Math.max(1, ...eigenvalues.map((e) => Math.hypot(e.re, e.im)));
  const largest = Math.max(...eigenvalues.map((e) => e.re));
  if (largest < -1e-9 * size) return "stable";
  if (largest > 1e-9 * size) return "unstable";
  return "undecided";
}

function describe(eigenvalues: Eigenvalue[] | null, stability: Stability | null, positive: boolean, laws: number): string {
  const where = positive ? "A positive equilibrium" : "An equilibrium on the boundary (some concentrations are zero)";
  const within = laws > 0 ? " within its compatibility class" : "";
  if (eigenvalues === null) return `${where} was found, but the eigenvalues of its Jacobian could not be computed.`;
  if (eigenvalues.length === 0) return `${where} was found; nothing changes${within}, so there is nothing to destabilise.`;
  const largest = Math.max(...eigenvalues.map((e) => e.re));
  const oscillatory = eigenvalues.some((e) => Math.abs(e.im) > 1e-9 * Math.max(1, Math.abs(e.re)));
  const shown = largest.toPrecision(3);
  switch (stability) {
    case "stable":
      return `${where} was found. It is stable: every eigenvalue of the Jacobian${within} has negative real part (the largest is ${shown}), so nearby states return to it${oscillatory ? " in damped oscillations" : ""}.`;
    case "unstable":
      return `${where} was found. It is unstable: an eigenvalue of the Jacobian${within} has positive real part (${shown}), so small disturbances grow${oscillatory ? " while oscillating — a sign of sustained oscillation nearby" : ""}.`;
    default:
      return `${where} was found. Linearisation cannot decide its stability: the largest real part of the eigenvalues${within} is zero within rounding${oscillatory ? " (a centre-like pair of imaginary eigenvalues)" : ""}, so higher-order terms decide.`;
  }
}
