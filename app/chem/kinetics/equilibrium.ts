// Equilibria and their stability. Damped Newton's method on the compatibility class: the
// equations of the variables each conservation law leads are redundant (they follow from the
// others), so they are replaced by the laws themselves, with totals taken from the initial state.
// Stability comes from the eigenvalues of the Jacobian restricted to the stoichiometric subspace —
// the conservation laws' zero eigenvalues say nothing about stability within a class.

import { eigs } from "mathjs";
import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { conservationBasis, stoichiometricMatrix, stoichiometricSubspace } from "./conservation";
import { DenseLu } from "./dense-lu";
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

export interface EquilibriumResult {
  converged: boolean;
  state: Record<string, number>;
  /** max |f(y)| at the returned state. */
  residual: number;
  iterations: number;
  /** Every variable is positive (not on the boundary of the orthant). */
  positive: boolean;
  /** Eigenvalues of the Jacobian within the compatibility class. */
  eigenvalues: Eigenvalue[];
  stability: Stability | null;
  summary: string;
}

export interface EquilibriumOptions {
  /** Where Newton's method starts; by default the end of a simulation to `settleTime`. */
  start?: ArrayLike<number>;
  settleTime?: number;
  maxIterations?: number;
}

export function networkEquilibrium(mechanism: Mechanism, network: Network, options: EquilibriumOptions = {}): EquilibriumResult {
  return specEquilibrium(networkSpec(mechanism, network), options);
}

export function polynomialEquilibrium(ode: PolynomialOde, options: EquilibriumOptions = {}): EquilibriumResult {
  return specEquilibrium(polynomialSpec(ode), options);
}

function specEquilibrium(spec: KineticSpec, options: EquilibriumOptions): EquilibriumResult {
  const system = compileKineticSystem(spec);
  const stoichiometry = stoichiometricMatrix(spec);
  const start = options.start ? Float64Array.from(options.start) : settle(system, options.settleTime ?? 100);
  return findEquilibrium(system, start, stoichiometry, options.maxIterations ?? 100);
}

function settle(system: OdeSystem, until: number): Float64Array {
  const run = simulateSystem(system, { until, samples: 2 });
  return Float64Array.from(system.names, (name) => run.series[name][1]);
}

export function findEquilibrium(system: OdeSystem, start: Float64Array, stoichiometry: number[][], maxIterations = 100): EquilibriumResult {
  const n = system.names.length;
  const { laws, leading } = conservationBasis(stoichiometry);
  const totals = laws.map((law) => law.reduce((sum, w, i) => sum + w * system.initial[i], 0));
  const replaced = new Map(leading.map((variable, l) => [variable, l]));

  const f = new Float64Array(n);
  const jacobian = new Float64Array(n * n);
  const lu = new DenseLu(n);
  const residual = (y: Float64Array, out: Float64Array) => {
    system.rhs(y, f);
    for (let i = 0; i < n; i++) {
      const l = replaced.get(i);
      out[i] = l === undefined ? f[i] : laws[l].reduce((sum, w, j) => sum + w * y[j], 0) - totals[l];
    }
    let size = 0;
    for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(out[i]));
    return size;
  };

  let y = Float64Array.from(start);
  if (system.nonNegative) for (let i = 0; i < n; i++) y[i] = Math.max(y[i], 0);
  const g = new Float64Array(n);
  const trial = new Float64Array(n);
  const trialResidual = new Float64Array(n);
  let size = residual(y, g);
  let iterations = 0;
  let converged = false;
  const scale = Math.max(1e-12, ...Array.from(y, Math.abs));
  while (iterations < maxIterations) {
    iterations++;
    system.jacobian(y, jacobian);
    lu.lu.set(jacobian);
    for (const [variable, l] of replaced) for (let j = 0; j < n; j++) lu.lu[variable * n + j] = laws[l][j];
    if (!lu.factor()) break;
    const step = Float64Array.from(g, (x) => -x);
    lu.solve(step);
    // Halve the step until the residual falls; never cross into negative concentrations.
    let lambda = 1;
    let trialSize = Number.POSITIVE_INFINITY;
    for (; lambda > 1e-10; lambda /= 2) {
      for (let i = 0; i < n; i++) {
        const next = y[i] + lambda * step[i];
        trial[i] = system.nonNegative && next < 0 ? y[i] * 0.01 : next;
      }
      trialSize = residual(trial, trialResidual);
      if (trialSize < (1 - 1e-4 * lambda) * size || trialSize === 0) break;
    }
    if (!(trialSize < size) && size !== 0) break;
    let change = 0;
    for (let i = 0; i < n; i++) change = Math.max(change, Math.abs(trial[i] - y[i]));
    y = Float64Array.from(trial);
    g.set(trialResidual);
    size = trialSize;
    if (change <= 1e-13 * scale || size <= 1e-14 * scale) {
      converged = true;
      break;
    }
  }
  if (!converged) converged = size <= 1e-9 * scale;

  system.rhs(y, f);
  const finalResidual = Math.max(0, ...Array.from(f, Math.abs));
  const state: Record<string, number> = {};
  system.names.forEach((name, i) => (state[name] = y[i]));
  const positive = Array.from(y).every((x) => x > 1e-12 * scale);
  if (!converged) {
    return {
      converged, state, residual: finalResidual, iterations, positive, eigenvalues: [], stability: null,
      summary: "No equilibrium was found from this starting point: Newton's method did not converge. Try a longer settling run or another guess.",
    };
  }
  system.jacobian(y, jacobian);
  const eigenvalues = classEigenvalues(jacobian, n, stoichiometricSubspace(stoichiometry));
  const stability = eigenvalues === null ? null : verdict(eigenvalues);
  return {
    converged, state, residual: finalResidual, iterations, positive, eigenvalues: eigenvalues ?? [], stability,
    summary: describe(eigenvalues, stability, positive, laws.length),
  };
}

/** Eigenvalues of Qᵀ J Q for an orthonormal basis Q of the stoichiometric subspace (J maps into it). */
function classEigenvalues(jacobian: Float64Array, n: number, basis: number[][]): Eigenvalue[] | null {
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
  try {
    const { values } = eigs(reduced, { eigenvectors: false });
    return (values as unknown as (number | { re: number; im: number })[]).map((v) =>
      typeof v === "number" ? { re: v, im: 0 } : { re: v.re, im: v.im },
    );
  } catch {
    return null;
  }
}

function verdict(eigenvalues: Eigenvalue[]): Stability {
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
