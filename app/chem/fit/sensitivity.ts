// Forward sensitivities s_p = ∂x/∂ln p of every species to chosen parameters, integrated together
// with the state by the stiff BDF. The variational equations s_p' = J(x)·s_p + ∂f/∂ln p are stacked
// under the state into one system (the simultaneous corrector of Maly & Petzold, Appl. Numer. Math.
// 20 (1996) 57–79): one Newton iteration corrects state and sensitivities together, and its matrix
// keeps only the diagonal blocks — the state's Jacobian J, shared by every sensitivity block —
// dropping the coupling ∂(J·s)/∂x, which would need second derivatives; the exact corrector matrix
// is block lower triangular with the same diagonal, so the modified Newton iteration still
// converges. Sensitivities take part in the error test (full error control).
//
// Log-scaled sensitivities keep every component at the size of the concentrations, so the one
// absolute tolerance suits them too; ∂f/∂ln p comes from a central difference of the right-hand
// side between the mechanism at p·e^±δ (δ = 1e-5, truncation and round-off both near 1e-10
// relatively), which covers rate coefficients, expression parameters such as `T` and custom laws
// alike. An initial concentration has ∂f/∂p = 0 and starts its sensitivity at p in its own row.

import { SimulationInputError } from "~/chem/kinetics/errors";
import { networkSystem } from "~/chem/kinetics/from-network";
import { Integrator } from "~/chem/kinetics/integrator";
import type { OdeSystem } from "~/chem/kinetics/ode-system";
import { DEFAULT_ATOL, DEFAULT_RTOL } from "~/chem/kinetics/settings";
import type { Mechanism } from "~/chem/model";
import { buildNetwork } from "~/chem/network";
import { mechanismAt, namedRateCoefficients, resolveParameters, valueOf, type Parameter } from "./parameters";
import { sensitivityRequestSchema, type RunOptions, type SensitivityRequest, type SensitivityResult } from "./types";

const LOG_STEP = 1e-5;

export interface Tolerances {
  rtol: number;
  atol: number;
}

export interface SensitivityCourses {
  names: string[];
  t: readonly number[];
  /** states[i][v]: species v at t[i]. */
  states: Float64Array[];
  /** sensitivities[i][p·n + v] = ∂x_v/∂ln p at t[i]. */
  sensitivities: Float64Array[];
}

/** State and log-scaled sensitivities at `times` (ascending, ≥ 0). */
export function integrateSensitivities(
  mechanism: Mechanism,
  parameters: readonly Parameter[],
  times: readonly number[],
  tolerances: Tolerances,
  options: RunOptions = {},
): SensitivityCourses {
  const { system, names } = augmentedSystem(mechanism, parameters);
  const n = names.length;
  const integrator = new Integrator(system, { ...tolerances, method: "bdf", signal: options.signal });
  const states: Float64Array[] = [];
  const sensitivities: Float64Array[] = [];
  const record = (state: Float64Array) => {
    states.push(state.slice(0, n).map((x) => Math.max(x, 0)));
    sensitivities.push(state.slice(n));
  };
  let first = 0;
  while (first < times.length && times[first] <= 0) {
    record(system.initial);
    first++;
  }
  if (first < times.length) {
    const later = times.slice(first);
    integrator.advance(later[later.length - 1], later, (_, state) => record(state), clipState(n));
  }
  return { names, t: times, states, sensitivities };
}

/** The state part clipped at 0 after each step (round-off); sensitivities may have any sign. */
function clipState(n: number): (y: Float64Array) => boolean {
  return (y) => {
    let changed = false;
    for (let i = 0; i < n; i++) {
      if (y[i] < 0) {
        y[i] = 0;
        changed = true;
      }
    }
    return changed;
  };
}

/** [x, s_1, …, s_P] with its right-hand side and the block-diagonal iteration Jacobian. */
function augmentedSystem(mechanism: Mechanism, parameters: readonly Parameter[]): { system: OdeSystem; names: string[] } {
  const base = networkSystem(mechanism, buildNetwork(mechanism));
  const names = base.names;
  const n = names.length;
  const blocks = parameters.length + 1;
  const size = n * blocks;
  const values = parameters.map((p) => valueOf(mechanism, p));
  const shifted = parameters.map((p, index) => {
    if (p.kind === "initial") return null;
    return [1, -1].map((sign) => {
      const at = values.slice();
      at[index] *= Math.exp(sign * LOG_STEP);
      const moved = mechanismAt(mechanism, parameters, at);
      return networkSystem(moved, buildNetwork(moved));
    });
  });

  const initial = new Float64Array(size);
  initial.set(base.initial);
  parameters.forEach((p, index) => {
    if (p.kind === "initial") initial[(index + 1) * n + names.indexOf(p.key)] = values[index];
  });

  const pattern = base.sparsity ?? names.map(() => Array.from({ length: n }, (_, j) => j));
  const J = new Float64Array(n * n);
  const plus = new Float64Array(n);
  const minus = new Float64Array(n);

  const system: OdeSystem = {
    names: Array.from({ length: size }, (_, i) => (i < n ? names[i] : `∂${names[i % n]}/∂ln ${parameters[Math.floor(i / n) - 1].name}`)),
    initial,
    nonNegative: false,
    sparsity: Array.from({ length: size }, (_, i) => pattern[i % n].map((j) => Math.floor(i / n) * n + j)),
    rhs(Y, dY) {
      const x = Y.subarray(0, n);
      base.rhs(x, dY);
      base.jacobian(x, J);
      for (let p = 0; p < parameters.length; p++) {
        const offset = (p + 1) * n;
        const pair = shifted[p];
        if (pair) {
          pair[0].rhs(x, plus);
          pair[1].rhs(x, minus);
        }
        for (let i = 0; i < n; i++) {
          let sum = pair ? (plus[i] - minus[i]) / (2 * LOG_STEP) : 0;
          const row = pattern[i];
          for (let e = 0; e < row.length; e++) sum += J[i * n + row[e]] * Y[offset + row[e]];
          dY[offset + i] = sum;
        }
      }
    },
    jacobian(Y, out) {
      base.jacobian(Y.subarray(0, n), J);
      out.fill(0);
      for (let b = 0; b < blocks; b++) {
        const offset = b * n;
        for (let i = 0; i < n; i++) out.set(J.subarray(i * n, (i + 1) * n), (offset + i) * size + offset);
      }
    },
  };
  return { system, names };
}

/** Normalized sensitivities ∂ln x/∂ln p at N evenly spaced times from 0 to `until`. */
export function computeSensitivities(mechanism: Mechanism, request: SensitivityRequest, options: RunOptions = {}): SensitivityResult {
  const parsed = sensitivityRequestSchema.safeParse(request);
  if (!parsed.success) throw new SimulationInputError(parsed.error.issues[0].message);
  const { until, samples } = parsed.data;
  const rtol = parsed.data.rtol ?? DEFAULT_RTOL;
  const atol = parsed.data.atol ?? DEFAULT_ATOL;
  const vary = parsed.data.vary ?? namedRateCoefficients(mechanism);
  if (vary.length === 0) throw new SimulationInputError("the mechanism has no named rate coefficients: name the parameters to differentiate by");
  const parameters = resolveParameters(mechanism, vary);
  const times = Array.from({ length: samples }, (_, i) => (i === samples - 1 ? until : (until * i) / (samples - 1)));
  const courses = integrateSensitivities(mechanism, parameters, times, { rtol, atol }, options);
  const n = courses.names.length;
  const series: SensitivityResult["series"] = {};
  const normalized: SensitivityResult["normalized"] = {};
  courses.names.forEach((species, v) => {
    series[species] = courses.states.map((state) => state[v]);
    normalized[species] = Object.fromEntries(
      parameters.map((p, index) => [p.name, courses.states.map((state, i) => (state[v] > atol ? courses.sensitivities[i][index * n + v] / state[v] : null))]),
    );
  });
  return { t: times, parameters: parameters.map((p) => p.name), series, normalized };
}

export interface Influence {
  parameter: string;
  /** The largest |∂ln x/∂ln p| over the run, and when. */
  peak: number;
  at: number;
}

/** The parameters ranked by their largest normalized influence on one species over the run. */
export function rankInfluence(result: SensitivityResult, species: string): Influence[] {
  const byParameter = result.normalized[species];
  if (!byParameter) throw new SimulationInputError(`"${species}" is not a species of the mechanism`);
  return result.parameters
    .map((parameter) => {
      let peak = 0;
      let at = result.t[0];
      byParameter[parameter].forEach((value, i) => {
        if (value !== null && Math.abs(value) > peak) [peak, at] = [Math.abs(value), result.t[i]];
      });
      return { parameter, peak, at };
    })
    .sort((a, b) => b.peak - a.peak);
}
