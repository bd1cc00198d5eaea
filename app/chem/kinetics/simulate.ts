// Time courses: N evenly spaced samples of a mechanism's or a polynomial ODE's solution from 0 to
// T inclusive, with step statistics. Concentrations are kept non-negative: an accepted step that
// undershoots 0 by round-off is projected back onto the non-negative orthant (Shampine, Thompson,
// Kierzenka & Byrne, Appl. Math. Comput. 170 (2005) 556–569), and samples are clipped the same
// way — the amounts involved are within the requested tolerances.

import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { networkSystem } from "./from-network";
import { polynomialSystem } from "./from-polynomial";
import { Integrator, type StepStatistics } from "./integrator";
import type { OdeSystem } from "./ode-system";
import { resolveSettings, type SimulationSettings } from "./settings";

export interface SimulationOptions extends SimulationSettings {
  /** Called with the fraction of [0, T] done, at most about once per percent. */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
  maxSteps?: number;
}

export interface SimulationResult {
  t: number[];
  series: Record<string, number[]>;
  stats: StepStatistics & { ms: number };
  /** The method that finished the run, and when the automatic choice switched to the stiff one. */
  method: "stiff" | "explicit";
  switchedAt: number | null;
}

export function simulateNetwork(mechanism: Mechanism, network: Network, options: SimulationOptions): SimulationResult {
  return simulateSystem(networkSystem(mechanism, network), options);
}

export function simulatePolynomialOde(ode: PolynomialOde, options: SimulationOptions): SimulationResult {
  return simulateSystem(polynomialSystem(ode), options);
}

export function simulateSystem(system: OdeSystem, options: SimulationOptions): SimulationResult {
  const started = performance.now();
  const { until, samples, rtol, atol, method } = resolveSettings(options);
  const integrator = new Integrator(system, { rtol, atol, method, signal: options.signal, maxSteps: options.maxSteps });
  const times = Array.from({ length: samples }, (_, i) => (i === samples - 1 ? until : (until * i) / (samples - 1)));
  const columns = system.names.map(() => new Array<number>(samples));
  const record = (index: number, state: Float64Array) => {
    for (let v = 0; v < columns.length; v++) columns[v][index] = system.nonNegative && state[v] < 0 ? 0 : state[v];
  };
  record(0, integrator.y);
  let sampled = 1;
  let reported = 0;
  integrator.advance(until, times.slice(1), (time, state) => {
    record(sampled++, state);
    const fraction = time / until;
    if (options.onProgress && fraction - reported >= 0.01) {
      reported = fraction;
      options.onProgress(fraction);
    }
  });
  if (reported < 1) options.onProgress?.(1);
  const series: Record<string, number[]> = {};
  system.names.forEach((name, v) => (series[name] = columns[v]));
  return {
    t: times,
    series,
    stats: { ...integrator.statistics, ms: Math.round((performance.now() - started) * 1000) / 1000 },
    method: integrator.method,
    switchedAt: integrator.switchedAt,
  };
}
