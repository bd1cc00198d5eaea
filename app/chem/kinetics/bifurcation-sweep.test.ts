import { describe, expect, it } from "vitest";
import { parseMechanism } from "~/chem/parse";
import { sweepBifurcations } from "./bifurcation-sweep";

describe("fold and Hopf points in two parameters", () => {
  it("traces the Brusselator's Hopf curve b = 1 + a² (Prigogine & Lefever 1968)", () => {
    const { mechanism } = parseMechanism("fixed [A] = 1\nfixed [B] = 1\nA -> X @ 1\n2X + Y -> 3X @ 1\nB + X -> Y + D @ 1\nX -> E @ 1\nfixed [D] = 0\nfixed [E] = 0");
    const result = sweepBifurcations(mechanism, {
      target: { kind: "fixed", species: "B" }, from: 0.5, to: 5,
      second: { target: { kind: "fixed", species: "A" }, from: 0.5, to: 1.5, steps: 3 },
    });
    expect(result.values).toEqual([0.5, 1, 1.5]);
    expect(result.bifurcations.map((b) => b.kind)).toEqual(["hopf", "hopf", "hopf"]);
    result.bifurcations.forEach((b) => expect(b.value).toBeCloseTo(1 + b.second ** 2, 8));
  });

  it("traces Schlögl's two fold curves, which meet in a cusp at a = √33", () => {
    // x' = a·x² − x³ − 11x + p with a = k₁[A]: along the equilibria p(x) = x³ − a·x² + 11x, which
    // turns where 3x² − 2a·x + 11 = 0, at x = (a ± √(a² − 33))/3 — two folds for a > √33, none below.
    const { mechanism } = parseMechanism("fixed [A] = 6\nfixed [B] = 1\nA + 2X <=> 3X @ 1, 1\nX <=> B @ 11, k4\nk4 = 1");
    const result = sweepBifurcations(mechanism, {
      target: { kind: "parameter", name: "k4" }, from: 0.5, to: 8,
      second: { target: { kind: "fixed", species: "A" }, from: 5.5, to: 6.5, steps: 3 },
    });
    expect(result.bifurcations.filter((b) => b.second === 5.5)).toEqual([]);
    for (const a of [6, 6.5]) {
      const folds = result.bifurcations.filter((b) => b.second === a);
      expect(folds.map((b) => b.kind)).toEqual(["fold", "fold"]);
      const expected = [1, -1].map((sign) => (a - sign * Math.sqrt(a * a - 33)) / 3).map((x) => x ** 3 - a * x ** 2 + 11 * x);
      folds.forEach((fold, i) => expect(fold.value).toBeCloseTo(expected[i], 7));
    }
  });
});
