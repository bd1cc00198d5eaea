import { describe, expect, it } from "vitest";
import { lorenz, massAction, rossler } from "../../../tests/fixtures/dynamics/models";
import { networkLyapunov, polynomialLyapunov } from "./lyapunov";

// Reference exponents: J. C. Sprott, Chaos and Time-Series Analysis, Oxford University Press 2003
// (Lorenz σ = 10, ρ = 28, β = 8/3: 0.9056; Rössler a = b = 0.2, c = 5.7: 0.0714; from memory).
describe("largest Lyapunov exponent (Benettin)", () => {
  it("Lorenz: 0.9056 within 3 %", () => {
    const result = polynomialLyapunov(lorenz(), { until: 1000, transient: 50 });
    expect(Math.abs(result.largest / 0.9056 - 1)).toBeLessThan(0.03);
    expect(result.converged).toBe(true);
    expect(result.history.length).toBeGreaterThan(100);
    expect(result.history.at(-1)?.estimate).toBe(result.largest);
  });

  it("Lorenz over long horizons and huge renormalisation intervals: still 0.9056 within 3 %", () => {
    // λ·τ ≈ 715 and ≈ 2670: v alone would grow past the largest double.
    for (const options of [{ until: 2000, interval: 790 }, { until: 3000, transient: 50, interval: 2950 }]) {
      const result = polynomialLyapunov(lorenz(), options);
      expect(Math.abs(result.largest / 0.9056 - 1)).toBeLessThan(0.03);
    }
  });

  it("Rössler: 0.0714 within 10 %", () => {
    const result = polynomialLyapunov(rossler(), { until: 5000, transient: 200 });
    expect(Math.abs(result.largest / 0.0714 - 1)).toBeLessThan(0.1);
  });

  it("a network relaxing to a stable equilibrium has a negative exponent (A ⇌ B: −(k₁ + k₋₁))", () => {
    const { mechanism, network } = massAction(["A", "B"], [[{ A: 1 }, { B: 1 }, 2], [{ B: 1 }, { A: 1 }, 1]], { A: 1 });
    const result = networkLyapunov(mechanism, network, { until: 20, transient: 1 });
    expect(result.largest).toBeCloseTo(-3, 2);
    // λ·τ ≈ −1200 in one interval: v alone would underflow to 0.
    const long = networkLyapunov(mechanism, network, { until: 401, transient: 1, interval: 400 });
    expect(long.largest).toBeCloseTo(-3, 2);
  });
});
