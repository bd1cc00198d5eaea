import { Solver } from "odex";
import { describe, expect, it } from "vitest";
import { brusselator, lotkaVolterra, massAction, robertson } from "../../../tests/fixtures/dynamics/models";
import { SimulationInputError } from "./errors";
import { simulateNetwork, simulatePolynomialOde } from "./simulate";

describe("Robertson's stiff problem", () => {
  const { mechanism, network } = robertson();

  it("matches the published values at t = 40", () => {
    // Reference values quoted from memory of Hairer & Wanner, Solving ODEs II (2nd ed.), §IV.1 /
    // their test set: y1 ≈ 0.7158, y2 ≈ 9.185e-6, y3 ≈ 0.2842 at t = 40.
    const run = simulateNetwork(mechanism, network, { until: 40, samples: 2, rtol: 1e-8, atol: 1e-14, method: "stiff" });
    expect(run.series.A[1]).toBeCloseTo(0.7158, 4);
    expect(run.series.B[1] / 9.185e-6).toBeCloseTo(1, 3);
    expect(run.series.C[1]).toBeCloseTo(0.2842, 4);
  });

  it("conserves A + B + C to 1e-10 all the way to t = 1e11", () => {
    const run = simulateNetwork(mechanism, network, { until: 1e11, samples: 200, rtol: 1e-6, atol: 1e-12, method: "stiff" });
    for (let i = 0; i < run.t.length; i++) {
      expect(Math.abs(run.series.A[i] + run.series.B[i] + run.series.C[i] - 1)).toBeLessThan(1e-10);
    }
    expect(run.stats.steps).toBeLessThan(1000);
    expect(run.series.C.at(-1)).toBeGreaterThan(0.9999999);
  });

  it("never reports a negative concentration, even at coarse tolerances", () => {
    const run = simulateNetwork(mechanism, network, { until: 1e11, samples: 500, rtol: 1e-3, atol: 1e-6 });
    for (const name of ["A", "B", "C"]) expect(Math.min(...run.series[name])).toBeGreaterThanOrEqual(0);
    for (let i = 0; i < run.t.length; i++) expect(Math.abs(run.series.A[i] + run.series.B[i] + run.series.C[i] - 1)).toBeLessThan(1e-12);
  });

  it("takes far fewer steps than the explicit method, and the automatic choice goes stiff", () => {
    const options = { until: 40, samples: 2, rtol: 1e-6, atol: 1e-12 };
    const stiff = simulateNetwork(mechanism, network, { ...options, method: "stiff" });
    const explicit = simulateNetwork(mechanism, network, { ...options, method: "explicit" });
    const auto = simulateNetwork(mechanism, network, { ...options, method: "auto" });
    expect(stiff.stats.steps * 50).toBeLessThan(explicit.stats.steps);
    expect(auto.method).toBe("stiff");
    expect(auto.switchedAt).not.toBeNull();
    expect(auto.series.A[1]).toBeCloseTo(stiff.series.A[1], 6);
  });
});

describe("non-stiff problems against odex (Hairer's GBS extrapolation code, as ported to JS)", () => {
  function odexSamples(ode: ReturnType<typeof lotkaVolterra>, until: number, count: number): number[][] {
    const n = ode.variables.length;
    const solver = new Solver(n);
    solver.absoluteTolerance = solver.relativeTolerance = 1e-12;
    solver.denseOutput = true;
    const rows: number[][] = [];
    const f = (_x: number, y: number[]) =>
      ode.rhs.map((terms) => terms.reduce((sum, t) => sum + t.coefficient * t.exponents.reduce((p, e, v) => p * y[v] ** e, 1), 0));
    solver.solve(f, 0, ode.initial, until, solver.grid(until / (count - 1), (_x, y) => rows.push([...y])));
    return rows;
  }

  for (const [name, ode, until] of [
    ["Lotka–Volterra", lotkaVolterra(), 20],
    ["Brusselator", brusselator(), 20],
  ] as const) {
    it(`${name}: dense-output samples agree at tight tolerance, both methods`, () => {
      const reference = odexSamples(ode, until, 41);
      for (const method of ["explicit", "stiff"] as const) {
        const run = simulatePolynomialOde(ode, { until, samples: 41, rtol: 1e-11, atol: 1e-12, method });
        ode.variables.forEach((v, j) => {
          for (let i = 0; i < 41; i++) expect(Math.abs(run.series[v][i] - reference[i][j])).toBeLessThan(method === "explicit" ? 1e-8 : 1e-6);
        });
      }
    });
  }
});

describe("Michaelis–Menten mass action", () => {
  // E + S ⇌ C → E + P (Michaelis & Menten 1913, elementary-step form of Briggs & Haldane 1925).
  const { mechanism, network } = massAction(
    ["E", "S", "C", "P"],
    [
      [{ E: 1, S: 1 }, { C: 1 }, 10],
      [{ C: 1 }, { E: 1, S: 1 }, 1],
      [{ C: 1 }, { E: 1, P: 1 }, 2],
    ],
    { E: 0.1, S: 1 },
  );

  it("keeps E + C and S + C + P constant", () => {
    const run = simulateNetwork(mechanism, network, { until: 50, samples: 101 });
    for (let i = 0; i < run.t.length; i++) {
      expect(run.series.E[i] + run.series.C[i]).toBeCloseTo(0.1, 9);
      expect(run.series.S[i] + run.series.C[i] + run.series.P[i]).toBeCloseTo(1, 9);
    }
    expect(run.series.P.at(-1)).toBeGreaterThan(0.99);
    expect(run.t).toHaveLength(101);
    expect(run.t.at(-1)).toBe(50);
  });

  it("evaluates a custom rate law like the equivalent mass-action step", () => {
    const custom = structuredClone(network);
    custom.reactions[2] = { ...custom.reactions[2], rate: null, law: "2 * C" };
    const a = simulateNetwork(mechanism, network, { until: 5, samples: 11, method: "stiff" });
    const b = simulateNetwork(mechanism, custom, { until: 5, samples: 11, method: "stiff" });
    for (let i = 0; i < 11; i++) expect(b.series.P[i]).toBeCloseTo(a.series.P[i], 7);
  });

  it("refuses to run when a rate coefficient is missing", () => {
    const missing = structuredClone(network);
    missing.reactions[1].rate = null;
    expect(() => simulateNetwork(mechanism, missing, { until: 1, samples: 2 })).toThrow(SimulationInputError);
    expect(() => simulateNetwork(mechanism, missing, { until: 1, samples: 2 })).toThrow(/no rate coefficient for C -> E \+ S \(line 2\)/);
  });

  it("refuses unusable settings", () => {
    expect(() => simulateNetwork(mechanism, network, { until: -1, samples: 2 })).toThrow(/end time/);
    expect(() => simulateNetwork(mechanism, network, { until: 1, samples: 1 })).toThrow(/samples/);
  });

  it("stops when cancelled", () => {
    const controller = new AbortController();
    controller.abort();
    expect(() => simulateNetwork(mechanism, network, { until: 1, samples: 2, signal: controller.signal })).toThrow(/cancelled/);
  });
});

describe("the automatic choice on a non-stiff problem", () => {
  it("stays with the explicit method", () => {
    const run = simulatePolynomialOde(lotkaVolterra(), { until: 50, samples: 2 });
    expect(run.method).toBe("explicit");
    expect(run.switchedAt).toBeNull();
    expect(run.stats.jacobians).toBe(0);
  });
});
