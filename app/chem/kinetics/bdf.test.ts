import { Solver } from "odex";
import { describe, expect, it } from "vitest";
import { generatedNetwork, lotkaVolterra, robertson } from "../../../tests/fixtures/dynamics/models";
import { networkSystem } from "./from-network";
import { polynomialSystem } from "./from-polynomial";
import { Integrator } from "./integrator";
import type { OdeSystem } from "./ode-system";
import { simulateNetwork, simulateSystem } from "./simulate";

// Reference values of the stiff problems: the test set of E. Hairer & G. Wanner (Solving ODEs II,
// §IV.10) as kept in the Bari IVP test set (F. Mazzia & C. Magherini), quoted from memory and
// confirmed in this session with scipy 1.17's Radau at rtol 1e-12 or tighter.

/** HIRES: plant physiology (Schäfer 1975), 8 equations, to t = 321.8122. */
const hires: OdeSystem = {
  names: ["y1", "y2", "y3", "y4", "y5", "y6", "y7", "y8"],
  initial: Float64Array.of(1, 0, 0, 0, 0, 0, 0, 0.0057),
  nonNegative: true,
  rhs(y, dy) {
    dy[0] = -1.71 * y[0] + 0.43 * y[1] + 8.32 * y[2] + 0.0007;
    dy[1] = 1.71 * y[0] - 8.75 * y[1];
    dy[2] = -10.03 * y[2] + 0.43 * y[3] + 0.035 * y[4];
    dy[3] = 8.32 * y[1] + 1.71 * y[2] - 1.12 * y[3];
    dy[4] = -1.745 * y[4] + 0.43 * y[5] + 0.43 * y[6];
    dy[5] = -280 * y[5] * y[7] + 0.69 * y[3] + 1.71 * y[4] - 0.43 * y[5] + 0.69 * y[6];
    dy[6] = 280 * y[5] * y[7] - 1.81 * y[6];
    dy[7] = -280 * y[5] * y[7] + 1.81 * y[6];
  },
  jacobian(y, J) {
    J.fill(0);
    const set = (i: number, j: number, v: number) => (J[i * 8 + j] = v);
    set(0, 0, -1.71), set(0, 1, 0.43), set(0, 2, 8.32);
    set(1, 0, 1.71), set(1, 1, -8.75);
    set(2, 2, -10.03), set(2, 3, 0.43), set(2, 4, 0.035);
    set(3, 1, 8.32), set(3, 2, 1.71), set(3, 3, -1.12);
    set(4, 4, -1.745), set(4, 5, 0.43), set(4, 6, 0.43);
    set(5, 3, 0.69), set(5, 4, 1.71), set(5, 5, -0.43 - 280 * y[7]), set(5, 6, 0.69), set(5, 7, -280 * y[5]);
    set(6, 5, 280 * y[7]), set(6, 6, -1.81), set(6, 7, 280 * y[5]);
    set(7, 5, -280 * y[7]), set(7, 6, 1.81), set(7, 7, -280 * y[5]);
  },
};
const hiresAtEnd = [7.371312573325668e-4, 1.442485726316185e-4, 5.888729740967575e-5, 1.175651343283149e-3, 2.386356198831331e-3, 6.238968252742796e-3, 2.849998395185769e-3, 2.850001604814231e-3];

/** Van der Pol in the test set's scaled form, ε = 1e-6, to t = 2. */
const epsilon = 1e-6;
const vanDerPol: OdeSystem = {
  names: ["y1", "y2"],
  initial: Float64Array.of(2, -0.66),
  nonNegative: false,
  rhs(y, dy) {
    dy[0] = y[1];
    dy[1] = ((1 - y[0] * y[0]) * y[1] - y[0]) / epsilon;
  },
  jacobian(y, J) {
    J[0] = 0;
    J[1] = 1;
    J[2] = (-2 * y[0] * y[1] - 1) / epsilon;
    J[3] = (1 - y[0] * y[0]) / epsilon;
  },
};
const vanDerPolAtEnd = [1.706167732170483, -0.8928097010247975];

function finalState(system: OdeSystem, until: number, rtol: number, atol: number) {
  const run = simulateSystem(system, { until, samples: 2, rtol, atol, method: "bdf" });
  return { values: system.names.map((name) => run.series[name][1]), stats: run.stats };
}

describe("the variable-order BDF on the stiff test set", () => {
  it("Robertson to t = 1e11: the published end state, and A + B + C = 1 to 1e-10 throughout", () => {
    const { mechanism, network } = robertson();
    const run = simulateNetwork(mechanism, network, { until: 1e11, samples: 300, rtol: 1e-7, atol: 1e-14, method: "bdf" });
    expect(run.stats.method).toBe("bdf");
    for (let i = 0; i < run.t.length; i++) expect(Math.abs(run.series.A[i] + run.series.B[i] + run.series.C[i] - 1)).toBeLessThan(1e-10);
    expect(run.series.A.at(-1)! / 2.083340149701255e-8).toBeCloseTo(1, 2);
    expect(run.series.B.at(-1)! / 8.333360770334713e-14).toBeCloseTo(1, 2);
  });

  it("HIRES at t = 321.8122 within 1e-4 relative at rtol 1e-7", () => {
    const { values } = finalState(hires, 321.8122, 1e-7, 1e-12);
    values.forEach((v, i) => expect(Math.abs(v / hiresAtEnd[i] - 1)).toBeLessThan(1e-4));
  });

  it("Van der Pol (ε = 1e-6) at t = 2 within 1e-4 relative at rtol 1e-7", () => {
    const { values, stats } = finalState(vanDerPol, 2, 1e-7, 1e-7);
    values.forEach((v, i) => expect(Math.abs(v / vanDerPolAtEnd[i] - 1)).toBeLessThan(1e-4));
    expect(stats.steps).toBeLessThan(3000);
  });

  it("reuses the Jacobian and the LU factors over many steps, and counts both", () => {
    const { mechanism, network } = generatedNetwork(200);
    const run = simulateSystem(networkSystem(mechanism, network), { until: 100, samples: 2, method: "bdf" });
    expect(run.stats.factorizations * 3).toBeLessThan(run.stats.steps);
    expect(run.stats.jacobians * 10).toBeLessThan(run.stats.steps);
    expect(run.stats.jacobians).toBeGreaterThan(0);
  });

  it("agrees with odex (Hairer's extrapolation code, as ported to JS) on dense output", () => {
    const ode = lotkaVolterra();
    const solver = new Solver(2);
    solver.absoluteTolerance = solver.relativeTolerance = 1e-12;
    solver.denseOutput = true;
    const rows: number[][] = [];
    const f = (_x: number, y: number[]) => [y[0] - y[0] * y[1], y[0] * y[1] - y[1]];
    solver.solve(f, 0, ode.initial, 20, solver.grid(0.5, (_x, y) => rows.push([...y])));
    const run = simulateSystem(polynomialSystem(ode), { until: 20, samples: 41, rtol: 1e-9, atol: 1e-12, method: "bdf" });
    ode.variables.forEach((v, j) => rows.forEach((row, i) => expect(Math.abs(run.series[v][i] - row[j])).toBeLessThan(1e-6)));
  });
});

describe("the automatic choice", () => {
  const { mechanism, network } = robertson();
  const system = networkSystem(mechanism, network);
  const run = (rtol: number, atol: number, method: "auto" | "stiff") => {
    const integrator = new Integrator(system, { rtol, atol, method });
    integrator.advance(40);
    return integrator.statistics;
  };

  it("goes to BDF when stiff at everyday tolerances and to RODAS4 at tight ones", () => {
    expect(run(1e-6, 1e-10, "auto").method).toBe("bdf");
    expect(run(1e-9, 1e-14, "auto").method).toBe("rodas4");
    expect(run(1e-6, 1e-10, "stiff").method).toBe("bdf");
  });

  it("does not linger in the explicit phase at a tight tolerance", () => {
    // Before the stiffness threshold followed the tolerance: 3,991 steps against 453.
    const auto = run(1e-8, 1e-14, "auto");
    const stiff = run(1e-8, 1e-14, "stiff");
    expect(auto.steps).toBeLessThan(1.5 * stiff.steps);
  });

  it("stays explicit on a non-stiff problem at any tolerance", () => {
    for (const rtol of [1e-3, 1e-6, 1e-10]) {
      const integrator = new Integrator(polynomialSystem(lotkaVolterra()), { rtol, atol: 1e-14, method: "auto" });
      integrator.advance(50);
      expect(integrator.statistics.method).toBe("dormand-prince");
    }
  });
});
