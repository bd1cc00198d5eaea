// Time courses: N evenly spaced samples of a mechanism's or a polynomial ODE's solution from 0 to
// T inclusive, with step statistics. Concentrations are kept non-negative: an accepted step that
// undershoots 0 by round-off is projected back onto the non-negative orthant (Shampine, Thompson,
// Kierzenka & Byrne, Appl. Math. Comput. 170 (2005) 556–569), and samples are clipped the same
// way — the amounts involved are within the requested tolerances.
// A pure mass-action system runs in the WebAssembly engine (wasm/wasm-engine.ts: the same methods,
// steps and numbers, without the JIT warm-up of a fresh process), one call per sample; anything
// else (custom rate laws, RODAS4) runs in the JavaScript Integrator.

import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { networkSystem } from "./from-network";
import { polynomialSystem } from "./from-polynomial";
import { SimulationCancelled } from "./errors";
import { DEFAULT_MAX_STEPS, Integrator, type StepStatistics } from "./integrator";
import type { OdeSystem } from "./ode-system";
import { resolveSettings, type SimulationSettings } from "./settings";
import { engineRuns, WasmRun } from "./wasm/wasm-engine";

export interface SimulationOptions extends SimulationSettings {
  /** Called with the fraction of [0, T] done, at most about once per percent. */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
  maxSteps?: number;
}

export interface SimulationResult {
  t: number[];
  series: Record<string, number[]>;
  /** `engine`: where the steps ran, the WebAssembly engine or the JavaScript Integrator. */
  stats: StepStatistics & { engine: "wasm" | "js"; ms: number };
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
  const settings = { rtol, atol, method, maxSteps: options.maxSteps ?? DEFAULT_MAX_STEPS };
  const times = Array.from({ length: samples }, (_, i) => (i === samples - 1 ? until : (until * i) / (samples - 1)));
  const columns = system.names.map(() => new Array<number>(samples));
  let sampled = 0;
  let reported = 0;
  const record = (time: number, state: Float64Array) => {
    const index = sampled++;
    for (let v = 0; v < columns.length; v++) columns[v][index] = system.nonNegative && state[v] < 0 ? 0 : state[v];
    const fraction = time / until;
    if (options.onProgress && fraction - reported >= 0.01) {
      reported = fraction;
      options.onProgress(fraction);
    }
  };
  record(0, system.initial);
  let run: WasmRun | Integrator;
  if (engineRuns(system, settings)) {
    run = new WasmRun(system, settings, until);
    for (const time of times.slice(1)) {
      if (options.signal?.aborted) throw new SimulationCancelled();
      record(time, run.advanceTo(time));
    }
  } else {
    run = new Integrator(system, { ...settings, signal: options.signal });
    run.advance(until, times.slice(1), record);
  }
  if (reported < 1) options.onProgress?.(1);
  const series: Record<string, number[]> = {};
  system.names.forEach((name, v) => (series[name] = columns[v]));
  const engine = run instanceof WasmRun ? "wasm" : "js";
  return {
    t: times,
    series,
    stats: { ...run.statistics, engine, ms: Math.round((performance.now() - started) * 1000) / 1000 },
    method: run.method,
    switchedAt: run.switchedAt,
  };
}
