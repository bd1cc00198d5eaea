import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { settingsProblem } from "~/chem/kinetics/settings";
import { MAX_ODE_BYTES, MAX_OVERRIDES, MAX_SAMPLES, MAX_SOURCE_BYTES, MAX_SWEEP_POINTS, MAX_SWEEP_SAMPLES, MAX_WITNESS_JOB_MS } from "~/chem/limits";
import { firstProblem } from "./fields";
import {
  equilibriumSettings,
  lyapunovSettings,
  mechanismJobRequest,
  realizeRequest,
  realizeSettings,
  simulateSettings,
  sweepSettings,
  textSimulationRequest,
  witnessSettings,
} from "./job-schemas";

/** The first problem the schema finds in the value, as the API and the CLI report it; null if none. */
const problem = (schema: z.ZodType, value: unknown) => {
  const parsed = schema.safeParse(value);
  return parsed.success ? null : firstProblem(parsed.error);
};

const sweep = {
  until: 10,
  samples: 400,
  target: { kind: "parameter", name: "k1" },
  from: 0.1,
  to: 10,
  points: 20,
  scale: "log",
  species: "A",
  observable: "final",
};

describe("simulate", () => {
  it("takes the library's limits, with or without the optional settings", () => {
    expect(problem(simulateSettings, { until: 1, samples: 2 })).toBeNull();
    expect(problem(simulateSettings, { until: 1, samples: MAX_SAMPLES, rtol: 1e-13, atol: 1e-20, method: "stiff" })).toBeNull();
  });

  it("refuses in the library's words, naming the field", () => {
    expect(problem(simulateSettings, { until: 0, samples: 5 })).toBe("until: the end time must be a positive number");
    expect(problem(simulateSettings, { until: 1, samples: MAX_SAMPLES + 1 })).toBe(`samples: the number of samples must be a whole number from 2 to ${MAX_SAMPLES}`);
    expect(problem(simulateSettings, { until: 1, samples: 2.5 })).toMatch(/whole number/);
    expect(problem(simulateSettings, { until: 1, samples: 3, rtol: 1 })).toMatch(/relative tolerance must lie in \[1e-13, 1\)/);
    expect(problem(simulateSettings, { until: 1, samples: 3, atol: 0 })).toMatch(/absolute tolerance/);
    expect(problem(simulateSettings, { until: 1, samples: 3, method: "euler" })).toMatch(/auto, stiff, explicit/);
    expect(problem(simulateSettings, { samples: 3 })).toMatch(/^until: /);
  });

  it("is the rule the library itself applies", () => {
    expect(settingsProblem({ until: 1, samples: 1 })).toBe(`the number of samples must be a whole number from 2 to ${MAX_SAMPLES}`);
    expect(settingsProblem({ until: 1, samples: 3 })).toBeNull();
  });
});

describe("equilibrium and Lyapunov", () => {
  it("take their own options", () => {
    expect(problem(equilibriumSettings, {})).toBeNull();
    expect(problem(equilibriumSettings, { settleTime: 50, start: [1, 0.5] })).toBeNull();
    expect(problem(equilibriumSettings, { settleTime: -1 })).toMatch(/settling time/);
    expect(problem(lyapunovSettings, { until: 300, transient: 10, interval: 0.5, method: "explicit" })).toBeNull();
    expect(problem(lyapunovSettings, { until: 300, transient: -1 })).toMatch(/^transient: /);
    expect(problem(lyapunovSettings, { until: 300, interval: 0 })).toMatch(/^interval: /);
  });
});

describe("sweep", () => {
  it("takes each kind of target", () => {
    expect(problem(sweepSettings, sweep)).toBeNull();
    expect(problem(sweepSettings, { ...sweep, target: { kind: "initial", species: "B" } })).toBeNull();
    expect(problem(sweepSettings, { ...sweep, target: { kind: "rate", reaction: 0 } })).toBeNull();
    expect(problem(sweepSettings, { ...sweep, target: { kind: "rate", reaction: -1 } })).toMatch(/^target\.reaction: /);
    expect(problem(sweepSettings, { ...sweep, target: { kind: "parameter", name: "k\u00001" } })).toMatch(/U\+0000/);
    expect(problem(sweepSettings, { ...sweep, target: { kind: "fixed", species: "F" } })).toBeNull();
    expect(problem(sweepSettings, { ...sweep, target: { kind: "step", label: "r3", direction: "backward" } })).toBeNull();
    expect(problem(sweepSettings, { ...sweep, target: { kind: "step", label: "r3", direction: "sideways" } })).toMatch(/^target\.direction: /);
  });

  it("bounds points and samples per point", () => {
    expect(problem(sweepSettings, { ...sweep, points: MAX_SWEEP_POINTS + 1 })).toBe(`points: a sweep takes from 2 to ${MAX_SWEEP_POINTS} points`);
    expect(problem(sweepSettings, { ...sweep, samples: MAX_SWEEP_SAMPLES + 1 })).toMatch(/^samples: /);
    expect(problem(sweepSettings, { ...sweep, from: -1 })).toMatch(/non-negative/);
  });
});

describe("realize", () => {
  it("bounds the multiplier and the extra complexes", () => {
    expect(problem(realizeSettings, { shift: "suggested", multiply: { x: 2 }, equivalents: true, complexes: ["2y"] })).toBeNull();
    expect(problem(realizeSettings, { multiply: { x: 21 } })).toMatch(/^multiply/);
    expect(problem(realizeSettings, { complexes: Array(201).fill("x") })).toMatch(/^complexes/);
    expect(problem(realizeSettings, { shift: 3 })).toMatch(/^shift/);
  });

  it("needs the ODE over the API, within its size", () => {
    expect(problem(realizeRequest, { ode: "x' = -x" })).toBeNull();
    expect(problem(realizeRequest, {})).toMatch(/^ode: /);
    expect(problem(realizeRequest, { ode: "é".repeat(MAX_ODE_BYTES / 2 + 1) })).toMatch(/over 64 KiB/);
  });
});

describe("requests with their text", () => {
  it("reads each kind of mechanism job by its kind", () => {
    expect(mechanismJobRequest.parse({ kind: "simulate", source: "A -> B @ 1", settings: { until: 1, samples: 3 } }).kind).toBe("simulate");
    expect(mechanismJobRequest.parse({ kind: "sweep", source: "A -> B @ k1 = 1", options: sweep }).kind).toBe("sweep");
    expect(problem(mechanismJobRequest, { kind: "simulate", source: "A -> B", settings: { until: 1, samples: 1 } })).toMatch(/^settings\.samples: /);
    expect(problem(mechanismJobRequest, { kind: "bifurcation", source: "A -> B", options: {} })).not.toBeNull();
  });

  it("takes overrides of parameters and initial values with every kind, within their limits", () => {
    const simulate = { kind: "simulate", source: "A -> B @ k\nk = 1", settings: { until: 1, samples: 3 } };
    expect(mechanismJobRequest.parse({ ...simulate, overrides: { parameters: { k: 2 } } })).toMatchObject({ overrides: { parameters: { k: 2 }, initial: {} } });
    expect(problem(mechanismJobRequest, { kind: "equilibrium", source: "A -> B @ 1", overrides: { initial: { A: 1 } }, options: {} })).toBeNull();
    expect(problem(mechanismJobRequest, { ...simulate, overrides: { parameters: { k: -1 } } })).toMatch(/^overrides\.parameters\.k: .*≥ 0/);
    const many = Object.fromEntries(Array.from({ length: MAX_OVERRIDES + 1 }, (_, i) => [`k${i}`, 1]));
    expect(problem(mechanismJobRequest, { ...simulate, overrides: { parameters: many } })).toBe(`overrides.parameters: At most ${MAX_OVERRIDES} overrides.`);
  });

  it("a text simulation takes an ODE or a mechanism, not both, each within its size", () => {
    const settings = { until: 1, samples: 3 };
    expect(problem(textSimulationRequest, { ode: "x' = -x", settings })).toBeNull();
    expect(problem(textSimulationRequest, { source: "A -> B @ 1", settings })).toBeNull();
    expect(problem(textSimulationRequest, { ode: "x' = -x", source: "A -> B @ 1", settings })).toBe("Send either ode or source.");
    expect(problem(textSimulationRequest, { settings })).toBe("Send either ode or source.");
    expect(problem(textSimulationRequest, { source: "#".repeat(MAX_SOURCE_BYTES + 1), settings })).toMatch(/over 1 MiB/);
  });
});

describe("witness", () => {
  it("takes a whole budget from a second to the limit, and says so otherwise", () => {
    expect(problem(witnessSettings, { budgetMs: 1000 })).toBeNull();
    expect(problem(witnessSettings, { budgetMs: MAX_WITNESS_JOB_MS })).toBeNull();
    for (const budgetMs of [999, MAX_WITNESS_JOB_MS + 1, 1500.5, Number.NaN, Infinity, "2000"]) {
      expect(problem(witnessSettings, { budgetMs })).toMatch(/budget|expected number/);
    }
    expect(problem(mechanismJobRequest, { kind: "witness", source: "A -> B @ 1", options: { budgetMs: 2000 } })).toBeNull();
  });
});
