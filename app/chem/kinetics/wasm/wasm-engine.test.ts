import { describe, expect, it, vi } from "vitest";
import { aggregation, brusselator, generatedNetwork, lotkaVolterra, robertson } from "../../../../tests/fixtures/dynamics/models";
import { SimulationCancelled } from "../errors";
import { networkSystem } from "../from-network";
import { polynomialSystem } from "../from-polynomial";
import { Integrator, type Method } from "../integrator";
import { compileKineticSystem, type KineticSystem } from "../kinetic-system";
import { simulateNetwork } from "../simulate";
import { engineRuns, WasmRun } from "./wasm-engine";

interface Case {
  system: KineticSystem;
  until: number;
  method?: Method;
  rtol?: number;
  atol?: number;
  maxSteps?: number;
}

const SAMPLES = 20;

/** Both integrators over the same samples: each one's states (or its error message) and statistics. */
function bothWays({ system, until, method = "auto", rtol = 1e-6, atol = 1e-10, maxSteps = 2_000_000 }: Case) {
  const settings = { rtol, atol, method, maxSteps };
  const times = Array.from({ length: SAMPLES }, (_, i) => (until * (i + 1)) / SAMPLES);
  const js: number[][] = [];
  const integrator = new Integrator(system, settings);
  let jsError: string | null = null;
  try {
    integrator.advance(until, times, (_, state) => js.push([...state]));
  } catch (error) {
    jsError = (error as Error).message;
  }
  const wasm: number[][] = [];
  const run = new WasmRun(system, settings, until);
  let wasmError: string | null = null;
  try {
    for (const time of times) wasm.push([...run.advanceTo(time)]);
  } catch (error) {
    wasmError = (error as Error).message;
  }
  return { js, wasm, jsError, wasmError, jsStats: integrator.statistics, wasmStats: run.statistics, integrator, run };
}

/**
 * Largest difference between the two runs' samples, relative to the size of the state (its largest
 * component): a component that has run down to 1e-30 agrees to round-off of the state, not of itself.
 */
function largestRelativeDifference(a: number[][], b: number[][]): number {
  let worst = 0;
  a.forEach((state, s) => {
    const scale = Math.max(...state.map(Math.abs), 1e-300);
    state.forEach((value, v) => (worst = Math.max(worst, Math.abs(value - b[s][v]) / scale)));
  });
  return worst;
}

describe("the WebAssembly engine takes the JavaScript integrator's steps", () => {
  const cases: [string, Case][] = [
    ["Robertson to 1e11", { system: networkSystem(robertson().mechanism, robertson().network), until: 1e11 }],
    ["aggregation of 50", { system: networkSystem(aggregation(50).mechanism, aggregation(50).network), until: 1e4 }],
    ["a random network of 50, rate coefficients over 5 decades", (() => {
      const { mechanism, network } = generatedNetwork(50, { decades: 5 });
      return { system: networkSystem(mechanism, network), until: 100 };
    })()],
    ["the Brusselator (non-stiff, oscillating)", { system: polynomialSystem(brusselator()), until: 20 }],
    ["Lotka–Volterra, explicit only", { system: polynomialSystem(lotkaVolterra()), until: 20, method: "explicit" }],
    ["Robertson with the BDF from the start", { system: networkSystem(robertson().mechanism, robertson().network), until: 1e5, method: "bdf" }],
  ];

  it.each(cases)("%s: same step counts, states within 1e-10", (_, problem) => {
    const { js, wasm, jsError, wasmError, jsStats, wasmStats, integrator, run } = bothWays(problem);
    expect(jsError).toBeNull();
    expect(wasmError).toBeNull();
    expect(wasmStats).toEqual(jsStats);
    expect(run.method).toBe(integrator.method);
    expect(run.switchedAt === null).toBe(integrator.switchedAt === null);
    if (run.switchedAt !== null) expect(Math.abs(run.switchedAt - (integrator.switchedAt as number))).toBeLessThanOrEqual(1e-10 * run.switchedAt);
    expect(largestRelativeDifference(js, wasm)).toBeLessThan(1e-10);
  });

  it("keeps Robertson's total A + B + C to 1e-10 all the way to 1e11", () => {
    const { wasm } = bothWays(cases[0][1]);
    for (const state of wasm) expect(Math.abs(state[0] + state[1] + state[2] - 1)).toBeLessThan(1e-10);
  });
});

describe("the engine fails as the JavaScript integrator does", () => {
  const decay = (coefficient: number) =>
    compileKineticSystem({
      names: ["x"],
      initial: [1],
      nonNegative: true,
      monomials: [{ coefficient, factors: [{ variable: 0, power: 1 }] }],
      custom: [],
      changes: [{ variable: 0, rate: 0, change: -1 }],
    });

  it.each([
    ["a NaN rate coefficient", { system: decay(Number.NaN), until: 1 }],
    ["an infinite rate coefficient", { system: decay(Number.POSITIVE_INFINITY), until: 1 }],
    ["too few steps allowed", { system: decay(1), until: 100, maxSteps: 5 }],
    // x' = x² from 1 blows up at t = 1: the steps shrink until they underflow.
    ["a blow-up", { system: polynomialSystem({ variables: ["x"], rhs: [[{ coefficient: 1, exponents: [2] }]], initial: [1] }), until: 2 }],
  ] as [string, Case][])("%s: the same message after the same steps", (_, problem) => {
    const { jsError, wasmError, jsStats, wasmStats } = bothWays(problem);
    expect(jsError).not.toBeNull();
    expect(wasmError).toBe(jsError);
    expect(wasmStats).toEqual(jsStats);
  });

  it("runs an empty system to the end", () => {
    const empty = compileKineticSystem({ names: [], initial: [], nonNegative: true, monomials: [], custom: [], changes: [] });
    const { jsError, wasmError, jsStats, wasmStats } = bothWays({ system: empty, until: 10 });
    expect([jsError, wasmError]).toEqual([null, null]);
    expect(wasmStats).toEqual(jsStats);
  });
});

describe("which engine runs", () => {
  const { mechanism, network } = robertson();

  it("the engine for mass action with Dormand–Prince and the BDF, JavaScript for RODAS4 and custom laws", () => {
    const system = networkSystem(mechanism, network);
    const settings = (method: Method, rtol = 1e-6) => ({ method, rtol, atol: 1e-10, maxSteps: 100 });
    expect(engineRuns(system, settings("auto"))).toBe(true);
    expect(engineRuns(system, settings("stiff"))).toBe(true);
    expect(engineRuns(system, settings("bdf", 1e-10))).toBe(true);
    expect(engineRuns(system, settings("auto", 1e-9))).toBe(false);
    expect(engineRuns(system, settings("rodas4"))).toBe(false);
    const withLaw = compileKineticSystem({
      names: ["x"],
      initial: [1],
      nonNegative: true,
      monomials: [],
      custom: [{ evaluate: (y) => y[0] / (1 + y[0]), dependsOn: [0] }],
      changes: [{ variable: 0, rate: 0, change: -1 }],
    });
    expect(engineRuns(withLaw, settings("auto"))).toBe(false);
  });

  it("simulate says which engine ran", () => {
    const options = { until: 40, samples: 5, rtol: 1e-6, atol: 1e-10 };
    expect(simulateNetwork(mechanism, network, { ...options, method: "auto" }).stats.engine).toBe("wasm");
    expect(simulateNetwork(mechanism, network, { ...options, method: "rodas4" }).stats.engine).toBe("js");
  });

  it("refuses to go on with a run after another has taken the engine", () => {
    const system = networkSystem(mechanism, network);
    const settings = { rtol: 1e-6, atol: 1e-10, method: "auto" as const, maxSteps: 1000 };
    const first = new WasmRun(system, settings, 10);
    first.advanceTo(1);
    new WasmRun(system, settings, 10).advanceTo(10);
    expect(() => first.advanceTo(2)).toThrow(/one at a time/);
  });

  it("an engine run sees its signal between samples", () => {
    const controller = new AbortController();
    const options = { until: 1e5, samples: 50, signal: controller.signal, onProgress: () => controller.abort() };
    expect(() => simulateNetwork(mechanism, network, options)).toThrow(SimulationCancelled);
  });
});

describe("compiling the engine ahead", () => {
  it("a module instance compiled ahead (as the CLI and the job threads do) runs as one compiled in the run", async () => {
    const { mechanism, network } = robertson();
    const settings = { rtol: 1e-6, atol: 1e-10, method: "auto" as const, maxSteps: 100_000 };
    const inRun = new WasmRun(networkSystem(mechanism, network), settings, 1e5).advanceTo(1e5).slice();
    vi.resetModules();
    const fresh = await import("./wasm-engine");
    await fresh.compileEngineAhead();
    await fresh.compileEngineAhead(); // a second call waits on the same compilation
    const ahead = new fresh.WasmRun(networkSystem(mechanism, network), settings, 1e5).advanceTo(1e5);
    expect([...ahead]).toEqual([...inRun]);
  });
});
