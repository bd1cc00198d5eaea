import { describe, expect, it } from "vitest";
import type { StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { ensembleGeometry } from "./ensemble-chart";

const result: StochasticResult = {
  t: [0, 5, 10],
  mean: { X: [0, 16, 20] },
  variance: { X: [0, 16, 25] },
  paths: [{ X: [0, 14, 22] }],
  stats: { runs: 10, events: 100, method: "direct", volume: 4, ms: 1 },
};

describe("ensembleGeometry", () => {
  it("draws the band from mean − sd (never below 0) to mean + sd, the mean and each path", () => {
    const box = { left: 0, top: 0, width: 100, height: 100 };
    const { x, y, shapes } = ensembleGeometry(result, ["X"], box);
    expect(x).toMatchObject({ min: 0, max: 10 });
    expect(y.min).toBe(0);
    // The largest value drawn is mean + sd at t = 10: 25, padded by the range.
    expect(y.max).toBeGreaterThanOrEqual(25);
    expect(y.ticks[0]).toBe(0);
    const scale = (n: number) => (100 - (n / y.max) * 100).toFixed(1);
    expect(shapes[0].band.startsWith(`M0.0,${scale(0)}L50.0,${scale(20)}L100.0,${scale(25)}`)).toBe(true);
    expect(shapes[0].band.endsWith(`L100.0,${scale(15)}L50.0,${scale(12)}L0.0,${scale(0)}Z`)).toBe(true);
    expect(shapes[0].mean).toBe(`M0.0,${scale(0)}L50.0,${scale(16)}L100.0,${scale(20)}`);
    expect(shapes[0].paths).toEqual([`M0.0,${scale(0)}L50.0,${scale(14)}L100.0,${scale(22)}`]);
  });
});
