// The largest Lyapunov exponent, a numerical indicator of chaos: the mean exponential growth rate
// of a tangent vector carried along a trajectory. Benettin's method: integrate the system with its
// variational equation v' = J(y)·v, renormalise v at fixed intervals (and whenever its length strays
// far from 1) and average the logarithms of the growth factors (Benettin, Galgani, Giorgilli & Strelcyn, Meccanica 15 (1980) 9–20).
// Conservation laws make every direction that changes a total neutral (exponent 0); the exponent
// that matters is the one within the compatibility class, so v is kept in the stoichiometric
// subspace (re-projected at each renormalisation, against round-off drift).

import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { IntegrationFailure, SimulationInputError } from "./errors";
import { stoichiometricMatrix, stoichiometricSubspace } from "./conservation";
import { networkSpec } from "./from-network";
import { polynomialSpec } from "./from-polynomial";
import { Integrator, type Method } from "./integrator";
import { compileKineticSystem, type KineticSpec } from "./kinetic-system";
import { finiteDifferenceColumns, type OdeSystem } from "./ode-system";

export interface LyapunovOptions {
  until: number;
  /** Time discarded before averaging, so the trajectory is on its attractor (default until/20). */
  transient?: number;
  /** Time between renormalisations (default a thousandth of the averaging time). */
  interval?: number;
  rtol?: number;
  atol?: number;
  method?: Method;
  signal?: AbortSignal;
  onProgress?: (fraction: number) => void;
}

export interface LyapunovResult {
  largest: number;
  /** The running estimate after each renormalisation (thinned to at most 500 points). */
  history: { t: number; estimate: number }[];
  /** The estimate stayed within 5 % (or 0.005 absolute) of its final value over the last quarter. */
  converged: boolean;
  transient: number;
  until: number;
  renormalisations: number;
  stats: { steps: number; rejected: number; jacobians: number; ms: number };
}

const HISTORY_POINTS = 500;
const MAX_RENORMALISATIONS = 1_000_000;
const RESCALE_AT = 1e3;

export function networkLyapunov(mechanism: Mechanism, network: Network, options: LyapunovOptions): LyapunovResult {
  return specLyapunov(networkSpec(mechanism, network), options);
}

export function polynomialLyapunov(ode: PolynomialOde, options: LyapunovOptions): LyapunovResult {
  return specLyapunov(polynomialSpec(ode), options);
}

function specLyapunov(spec: KineticSpec, options: LyapunovOptions): LyapunovResult {
  const subspace = stoichiometricSubspace(stoichiometricMatrix(spec));
  return largestLyapunovExponent(compileKineticSystem(spec), options, subspace);
}

/** `subspace`: orthonormal vectors spanning the directions the state can move in (all, if omitted). */
export function largestLyapunovExponent(system: OdeSystem, options: LyapunovOptions, subspace?: number[][]): LyapunovResult {
  const started = performance.now();
  const { until } = options;
  const transient = options.transient ?? until / 20;
  if (!(Number.isFinite(until) && until > 0)) throw new SimulationInputError("the end time must be a positive number");
  if (!(transient >= 0 && transient < until)) throw new SimulationInputError("the transient must lie in [0, end time)");
  const interval = options.interval ?? (until - transient) / 1000;
  if (!(interval > 0 && interval <= until - transient)) throw new SimulationInputError("the renormalisation interval must be positive and within the run");
  if ((until - transient) / interval > MAX_RENORMALISATIONS) {
    throw new SimulationInputError(`the renormalisation interval is too short: at most ${MAX_RENORMALISATIONS} renormalisations per run`);
  }
  const integration = { rtol: options.rtol ?? 1e-8, atol: options.atol ?? 1e-10, method: options.method ?? "auto", signal: options.signal };

  const settling = new Integrator(system, integration);
  settling.advance(transient);

  const n = system.names.length;
  const tangent = variationalSystem(system);
  const start = new Float64Array(2 * n);
  start.set(settling.y);
  // A generic start (golden-ratio sequence), so it is unlikely to lie in an invariant subspace.
  for (let i = 0; i < n; i++) start[n + i] = 1 + ((i * 0.6180339887498949) % 1);
  const keepInSubspace = subspace && subspace.length < n ? projector(subspace) : (v: Float64Array) => v;
  const direction = keepInSubspace(start.subarray(n));
  const length = Math.hypot(...direction);
  if (length === 0) throw new SimulationInputError("the state cannot move: there is no exponent to estimate");
  for (let i = 0; i < n; i++) direction[i] /= length;
  const integrator = new Integrator(tangent, integration, start, transient);

  const estimates: { t: number; estimate: number }[] = [];
  let logSum = 0;
  /** Projects v back into the subspace, adds the logarithm of its length and rescales it to 1. */
  const renormalise = (v: Float64Array, t: number) => {
    keepInSubspace(v);
    const size = Math.hypot(...v);
    if (!(size > 0 && Number.isFinite(size))) throw new IntegrationFailure(`the tangent vector degenerated at t = ${t.toPrecision(6)}`);
    logSum += Math.log(size);
    for (let i = 0; i < n; i++) v[i] /= size;
  };
  // v grows like e^(λt): over a long interval it would overflow (λ·τ past ~700) or underflow, so it
  // is also rescaled whenever its length leaves [1/RESCALE_AT, RESCALE_AT]. Rescaling is linear,
  // so the sum of logarithms, and with it the estimate, is the same whenever it happens.
  const rescaleWhenFar = (y: Float64Array) => {
    const size = Math.hypot(...y.subarray(n));
    if (size >= 1 / RESCALE_AT && size <= RESCALE_AT) return false;
    renormalise(y.subarray(n), integrator.t);
    return true;
  };
  let reported = 0;
  const renormalisations = Math.max(1, Math.round((until - transient) / interval));
  for (let k = 1; k <= renormalisations; k++) {
    const t = k === renormalisations ? until : transient + k * interval;
    integrator.advance(t, [], undefined, rescaleWhenFar);
    renormalise(integrator.y.subarray(n), t);
    integrator.setState(integrator.y);
    estimates.push({ t, estimate: logSum / (t - transient) });
    const fraction = t / until;
    if (options.onProgress && fraction - reported >= 0.01) {
      reported = fraction;
      options.onProgress(fraction);
    }
  }

  if (reported < 1) options.onProgress?.(1);
  const largest = estimates[estimates.length - 1].estimate;
  const lastQuarter = estimates.filter((e) => e.t >= until - (until - transient) / 4);
  const tolerance = Math.max(0.05 * Math.abs(largest), 0.005);
  const converged = estimates.length >= 8 && lastQuarter.every((e) => Math.abs(e.estimate - largest) <= tolerance);
  const stride = Math.ceil(estimates.length / HISTORY_POINTS);
  const history = estimates.filter((_, i) => i % stride === 0 || i === estimates.length - 1);
  const steps = settling.statistics;
  const tangentSteps = integrator.statistics;
  return {
    largest,
    history,
    converged,
    transient,
    until,
    renormalisations,
    stats: {
      steps: steps.steps + tangentSteps.steps,
      rejected: steps.rejected + tangentSteps.rejected,
      jacobians: steps.jacobians + tangentSteps.jacobians,
      ms: Math.round((performance.now() - started) * 1000) / 1000,
    },
  };
}

/** v ↦ Q·Qᵀ·v in place, for orthonormal columns Q. */
function projector(basis: number[][]): (v: Float64Array) => Float64Array {
  const copy = basis.map((q) => Float64Array.from(q));
  return (v) => {
    const coordinates = copy.map((q) => q.reduce((sum, qi, i) => sum + qi * v[i], 0));
    v.fill(0);
    copy.forEach((q, k) => q.forEach((qi, i) => (v[i] += coordinates[k] * qi)));
    return v;
  };
}

/**
 * The system together with its variational equation, state (y, v): y' = f(y), v' = J(y)·v. Its own
 * Jacobian [[J, 0], [∂(Jv)/∂y, J]] takes the lower-left block by finite differences.
 */
function variationalSystem(system: OdeSystem): OdeSystem {
  const n = system.names.length;
  const jacobian = new Float64Array(n * n);
  const f0 = new Float64Array(2 * n);
  const scratch = { state: new Float64Array(2 * n), value: new Float64Array(2 * n) };
  const columns = Int32Array.from({ length: n }, (_, j) => j);
  const tangent: OdeSystem = {
    names: [...system.names, ...system.names.map((name) => `δ${name}`)],
    initial: new Float64Array(2 * n),
    nonNegative: false,
    rhs(z, dz) {
      const y = z.subarray(0, n);
      system.rhs(y, dz.subarray(0, n));
      system.jacobian(y, jacobian);
      for (let i = 0; i < n; i++) {
        let sum = 0;
        for (let j = 0; j < n; j++) sum += jacobian[i * n + j] * z[n + j];
        dz[n + i] = sum;
      }
    },
    jacobian(z, out) {
      tangent.rhs(z, f0);
      out.fill(0);
      finiteDifferenceColumns(tangent.rhs, z, f0, columns, out, scratch);
      system.jacobian(z.subarray(0, n), jacobian);
      const size = 2 * n;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          out[i * size + j] = jacobian[i * n + j];
          out[(n + i) * size + n + j] = jacobian[i * n + j];
        }
      }
    },
  };
  return tangent;
}
