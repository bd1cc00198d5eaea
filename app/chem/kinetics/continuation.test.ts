import { describe, expect, it } from "vitest";
import type { Mechanism } from "~/chem/model";
import { buildNetwork } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";
import { classEigenvalues } from "./equilibrium";
import { continueEquilibria, foldTest, hopfTest, type ContinuationResult } from "./continuation";
import { simulateNetwork } from "./simulate";
import { variedMechanism } from "./sweep";

const mechanismOf = (source: string): Mechanism => {
  const { mechanism, diagnostics } = parseMechanism(source);
  expect(diagnostics.filter((d) => d.severity === "error")).toEqual([]);
  return mechanism;
};

/** The Brusselator with [A] = a and [B] = b held: x' = a − (b + 1)x + x²y, y' = bx − x²y. */
const brusselator = (a: number) =>
  mechanismOf(`fixed [A] = ${a}\nfixed [B] = 1\nA -> X @ 1\n2X + Y -> 3X @ 1\nB + X -> Y + D @ 1\nX -> E @ 1\nfixed [D] = 0\nfixed [E] = 0`);

/** Schlögl's second model with [A] = 6, [B] = 1 held and the feed coefficient a parameter. */
const schloegl = mechanismOf(`fixed [A] = 6\nfixed [B] = 1\nA + 2X <=> 3X @ 1, 1\nX <=> B @ 11, k4\nk4 = 5\n[X]0 = 0.5`);

/**
 * Whether a run started a relative 1 % off the equilibrium comes back to it: the distance after
 * `until` against the distance at the start.
 */
function returnsToEquilibrium(mechanism: Mechanism, state: Record<string, number>, until: number): boolean {
  const perturbed = Object.fromEntries(Object.entries(state).map(([name, x]) => [name, x * 1.01]));
  const network = buildNetwork(mechanism);
  const run = simulateNetwork({ ...mechanism, initial: perturbed }, network, { until, samples: 2, rtol: 1e-10, atol: 1e-12 });
  const distance = (at: number) => Math.hypot(...Object.keys(state).map((name) => run.series[name][at] - state[name]));
  return distance(1) < distance(0) / 10;
}

/** The point of the result nearest a value on the branch piece whose stability is `stable`. */
const nearest = (result: ContinuationResult, value: number, stable: boolean) =>
  result.points.filter((p) => p.stable === stable).reduce((best, p) => (Math.abs(p.value - value) < Math.abs(best.value - value) ? p : best));

describe("continuation of equilibria", () => {
  it("finds the Brusselator's Hopf point at b = 1 + a² with frequency a (Prigogine & Lefever 1968)", () => {
    // The equilibrium is x = a, y = b/a; the Jacobian there is [[b − 1, a²], [−b, −a²]], with
    // trace b − 1 − a² and determinant a² > 0: a complex pair crosses when the trace does, at
    // b = 1 + a², with eigenvalues ±i·a.
    for (const a of [1, 1.5]) {
      const result = continueEquilibria(brusselator(a), { target: { kind: "fixed", species: "B" }, from: 0.5, to: 5 });
      expect(result.ended).toBe("range");
      expect(result.bifurcations.map((b) => b.kind)).toEqual(["hopf"]);
      const [hopf] = result.bifurcations;
      expect(hopf.value).toBeCloseTo(1 + a * a, 8);
      expect(hopf.frequency).toBeCloseTo(a, 6);
      expect(hopf.state.X).toBeCloseTo(a, 8);
      for (const point of result.points) {
        expect(point.state.X).toBeCloseTo(a, 8);
        expect(point.state.Y).toBeCloseTo(point.value / a, 8);
        expect(point.stable).toBe(point.value < 1 + a * a);
      }
    }
  });

  it("stability on each side of the Hopf point agrees with a direct simulation", () => {
    const mechanism = brusselator(1);
    const result = continueEquilibria(mechanism, { target: { kind: "fixed", species: "B" }, from: 0.5, to: 3 });
    const at = variedMechanism({ kind: "fixed", species: "B" }, mechanism);
    const stable = nearest(result, 1.5, true);
    const unstable = nearest(result, 2.5, false);
    expect(returnsToEquilibrium(at(stable.value), stable.state, 200)).toBe(true);
    expect(returnsToEquilibrium(at(unstable.value), unstable.state, 200)).toBe(false);
  });

  it("finds the folds of Schlögl's model from the closed form (Schlögl, Z. Physik 253 (1972) 147)", () => {
    // With p = k4·[B], the rate of change is x' = 6x² − x³ − 11x + p (k₁[A] = 6, k₂ = 1, k₃ = 11).
    // Along the equilibria p(x) = x³ − 6x² + 11x, and p turns where p'(x) = 3x² − 12x + 11 = 0:
    // x = 2 ∓ 1/√3, where p = p(x) = 6 ± 2/(3√3) (with x = 2 + e, p = 6 − e + e³ and e² = 1/3).
    // Between the two values three equilibria coexist: two stable, one unstable between them.
    const result = continueEquilibria(schloegl, { target: { kind: "parameter", name: "k4" }, from: 5, to: 7 });
    expect(result.ended).toBe("range");
    expect(result.bifurcations.map((b) => b.kind)).toEqual(["fold", "fold"]);
    const [upper, lower] = result.bifurcations;
    const e = 1 / Math.sqrt(3);
    expect(upper.value).toBeCloseTo(6 + (2 * e) / 3, 8);
    expect(upper.state.X).toBeCloseTo(2 - e, 5);
    expect(lower.value).toBeCloseTo(6 - (2 * e) / 3, 8);
    expect(lower.state.X).toBeCloseTo(2 + e, 5);
    // The branch runs up the lower stable piece, back along the unstable middle, up the upper one.
    const middle = result.points.filter((p) => p.state.X > 2 - e && p.state.X < 2 + e);
    expect(middle.length).toBeGreaterThan(3);
    for (const point of result.points) {
      const x = point.state.X;
      expect(point.value).toBeCloseTo(x ** 3 - 6 * x ** 2 + 11 * x, 8);
      if (Math.abs(x - (2 - e)) > 1e-3 && Math.abs(x - (2 + e)) > 1e-3) expect(point.stable).toBe(x < 2 - e || x > 2 + e);
    }
    expect(result.points[0].value).toBe(5);
    expect(result.points.at(-1)?.value).toBe(7);
  });

  it("stability on each of Schlögl's three branches agrees with a direct simulation", () => {
    const result = continueEquilibria(schloegl, { target: { kind: "parameter", name: "k4" }, from: 5, to: 7 });
    const at = variedMechanism({ kind: "parameter", name: "k4" }, schloegl);
    const onBranch = (low: number, high: number) =>
      result.points.filter((p) => p.state.X > low && p.state.X < high).reduce((best, p) => (Math.abs(p.value - 6) < Math.abs(best.value - 6) ? p : best));
    for (const [low, high, stable] of [[0, 1.3, true], [1.6, 2.4, false], [2.7, 5, true]] as const) {
      const point = onBranch(low, high);
      expect(point.stable).toBe(stable);
      expect(returnsToEquilibrium(at(point.value), point.state, 50)).toBe(stable);
    }
  });

  it("varies a total: the class follows the initial amount of A ⇌ B, where B = k₁/(k₁ + k₋₁)·A₀", () => {
    const mechanism = mechanismOf("A <=> B @ 2, 1\n[A]0 = 1");
    const result = continueEquilibria(mechanism, { target: { kind: "initial", species: "A" }, from: 1, to: 4 });
    expect(result.ended).toBe("range");
    expect(result.bifurcations).toEqual([]);
    for (const point of result.points) {
      expect(point.state.B).toBeCloseTo((2 / 3) * point.value, 9);
      expect(point.stable).toBe(true);
    }
  });

  it("runs downwards, and stops at its point budget", () => {
    const down = continueEquilibria(brusselator(1), { target: { kind: "fixed", species: "B" }, from: 3, to: 1 });
    expect(down.bifurcations.map((b) => [b.kind, Math.round(b.value * 1e6) / 1e6])).toEqual([["hopf", 2]]);
    expect(down.points.at(-1)?.value).toBe(1);
    const short = continueEquilibria(brusselator(1), { target: { kind: "fixed", species: "B" }, from: 1, to: 3, maxPoints: 5 });
    expect(short.ended).toBe("budget");
    expect(short.points).toHaveLength(5);
  });

  it("refuses a range of one value, or a target the mechanism does not have", () => {
    expect(() => continueEquilibria(schloegl, { target: { kind: "parameter", name: "k4" }, from: 2, to: 2 })).toThrow(/two different/);
    expect(() => continueEquilibria(schloegl, { target: { kind: "parameter", name: "nope" }, from: 1, to: 2 })).toThrow(/no parameter nope/);
  });
});

describe("test functions", () => {
  it("the fold test is the sign of the determinant, the Hopf test that of Π(λᵢ + λⱼ)", () => {
    const pair = (re: number, im: number) => [{ re, im }, { re, im: -im }];
    expect(foldTest([{ re: -1, im: 0 }, { re: 2, im: 0 }])).toBe(-1);
    expect(foldTest([...pair(3, 1), { re: -1, im: 1e-17 }])).toBe(-1);
    // A complex pair crossing: λ + λ̄ = 2 Re λ changes sign.
    expect(hopfTest([...pair(-0.1, 2), { re: -3, im: 0 }])).toBe(-hopfTest([...pair(0.1, 2), { re: -3, im: 0 }]));
    // Two real eigenvalues meeting and turning complex: no sign change.
    expect(hopfTest([{ re: -1.1, im: 0 }, { re: -0.9, im: 0 }])).toBe(hopfTest(pair(-1, 0.1)));
  });

  it("eigenvalues in the class match the Brusselator's closed form", () => {
    // [[b − 1, a²], [−b, −a²]] at a = 1, b = 3 has trace 1 and determinant 1: λ = (1 ± i√3)/2.
    const eigenvalues = classEigenvalues(Float64Array.from([2, 1, -3, -1]), 2, [[1, 0], [0, 1]]);
    const sorted = [...(eigenvalues ?? [])].sort((p, q) => p.im - q.im);
    expect(sorted[0].re).toBeCloseTo(0.5, 12);
    expect(sorted[1].im).toBeCloseTo(Math.sqrt(3) / 2, 12);
  });
});
