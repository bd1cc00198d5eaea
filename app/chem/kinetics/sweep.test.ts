import { describe, expect, it } from "vitest";
import { massAction } from "../../../tests/fixtures/dynamics/models";
import { buildNetwork } from "../network";
import { parseMechanism } from "../parse";
import { oscillationPeriod } from "./oscillation";
import { sweepNetwork, sweepValues } from "./sweep";

describe("parameter sweeps", () => {
  it("spaces values linearly or logarithmically", () => {
    expect(sweepValues(1, 3, 3, "linear")).toEqual([1, 2, 3]);
    expect(sweepValues(1, 100, 3, "log").map((v) => Math.round(v * 1e9) / 1e9)).toEqual([1, 10, 100]);
    expect(() => sweepValues(0, 1, 3, "log")).toThrow(/positive/);
  });

  it("the final value of A ⇌ B follows the initial amount: B(∞) = k₁/(k₁ + k₋₁)·A₀", () => {
    const { mechanism, network } = massAction(["A", "B"], [[{ A: 1 }, { B: 1 }, 2], [{ B: 1 }, { A: 1 }, 1]], { A: 1 });
    const result = sweepNetwork(mechanism, network, {
      target: { kind: "initial", species: "A" }, from: 1, to: 4, points: 4, scale: "linear",
      species: "B", observable: "final", until: 20, samples: 2,
    });
    result.observed.forEach((b, i) => expect(b).toBeCloseTo((2 / 3) * result.values[i], 6));
  });

  it("the Brusselator oscillates once b passes the Hopf point b = 1 + a² (Prigogine & Lefever 1968)", () => {
    // 0 → X (a = 1), 2X + Y → 3X, X → Y (b), X → 0.
    const { mechanism, network } = massAction(
      ["X", "Y"],
      [[{}, { X: 1 }, 1], [{ X: 2, Y: 1 }, { X: 3 }, 1], [{ X: 1 }, { Y: 1 }, 3], [{ X: 1 }, {}, 1]],
      { X: 1, Y: 1 },
    );
    const result = sweepNetwork(mechanism, network, {
      target: { kind: "rate", reaction: 2 }, from: 1.2, to: 3, points: 4, scale: "linear",
      species: "X", observable: "period", until: 120, samples: 3001,
    });
    expect(result.observed.slice(0, 2)).toEqual([null, null]);
    // Near the Hopf point the period tends to 2π/√(a²) = 2π; it lengthens as b grows.
    expect(result.observed[2]).toBeGreaterThan(6);
    expect(result.observed[3] as number).toBeGreaterThan(result.observed[2] as number);
  });

  it("a sampled sine has its period; a decaying one has none", () => {
    const t = Array.from({ length: 2001 }, (_, i) => i * 0.01);
    expect(oscillationPeriod(t, t.map((x) => 2 + Math.sin(2 * Math.PI * x)))).toBeCloseTo(1, 3);
    expect(oscillationPeriod(t, t.map((x) => 2 + Math.exp(-x) * Math.sin(2 * Math.PI * x)))).toBeNull();
  });
});

describe("sweeping a parameter", () => {
  const sweepK = (source: string) => {
    const { mechanism } = parseMechanism(source);
    return sweepNetwork(mechanism, buildNetwork(mechanism), {
      target: { kind: "parameter", name: "k" }, from: 0.5, to: 2, points: 2, scale: "log",
      species: "B", observable: "final", until: 30, samples: 2,
    });
  };

  it("re-folds it into every coefficient that uses it, fixed species included", () => {
    // A → B @ k with fixed [F] = 2 folded in: effective rate 2k, and B → A @ 1, so B(∞)/A(∞) = 2k.
    const result = sweepK("A + F -> B @ k\nB -> A @ 1\nk = 1\nfixed [F] = 2\n[A]0 = 1");
    expect(result.observed[0]).toBeCloseTo(1 / 2, 6);
    expect(result.observed[1]).toBeCloseTo(4 / 5, 6);
  });

  it("brings back a reaction left out of the network while the parameter was 0", () => {
    const result = sweepK("A + F -> B @ k\nB -> A @ 1\nk = 0\nfixed [F] = 2\n[A]0 = 1");
    expect(result.observed[0]).toBeCloseTo(1 / 2, 6);
    expect(result.observed[1]).toBeCloseTo(4 / 5, 6);
  });
});

describe("sweeping a temperature, a held species and a step's coefficient", () => {
  const sweep = (source: string, target: Parameters<typeof sweepNetwork>[2]["target"], range: [number, number], species: string, observable: "final" | "period", until: number, samples = 2) => {
    const { mechanism, diagnostics } = parseMechanism(source);
    expect(diagnostics.filter((d) => d.severity === "error")).toEqual([]);
    return sweepNetwork(mechanism, buildNetwork(mechanism), { target, from: range[0], to: range[1], points: 3, scale: "linear", species, observable, until, samples, rtol: 1e-10, atol: 1e-14 });
  };

  it("T in an Arrhenius coefficient: A(t) = A₀·exp(−k(T)·t) at each temperature", () => {
    const k = (T: number) => 1e3 * Math.exp(-3000 / T);
    const result = sweep("A -> B @ 1e3 * exp(-3000 / T)\nT = 300\n[A]0 = 1", { kind: "parameter", name: "T" }, [500, 700], "A", "final", 0.1);
    result.observed.forEach((a, i) => expect(a! / Math.exp(-k(result.values[i]) * 0.1)).toBeCloseTo(1, 6));
  });

  it("the Brusselator's held B: no oscillation below the Hopf point B = 1 + A² = 2, oscillation above", () => {
    const source = "fixed [A] = 1\nfixed [B] = 1.5\nA -> X @ 1\n2X + Y -> 3X @ 1\nB + X -> Y + D @ 1\nX -> E @ 1\nfixed [D] = 0\nfixed [E] = 0\n[X]0 = 1\n[Y]0 = 1";
    const result = sweep(source, { kind: "fixed", species: "B" }, [1.5, 3], "X", "period", 120, 3001);
    expect(result.observed[0]).toBeNull();
    expect(result.observed[2]).toBeGreaterThan(6);
  });

  it("a step's coefficient by label, either direction: B(∞)/A(∞) = kf/kb", () => {
    const result = sweep("r1: A <=> B @ kf = 1, 2\n[A]0 = 1", { kind: "step", label: "r1", direction: "backward" }, [1, 3], "B", "final", 40);
    result.observed.forEach((b, i) => expect(b).toBeCloseTo(1 / (1 + result.values[i]), 6));
    expect(() => sweep("A -> B @ 1", { kind: "step", label: "r9" }, [1, 2], "B", "final", 1)).toThrow(/no step labelled r9/);
    expect(() => sweep("r1: A -> B @ 1", { kind: "fixed", species: "A" }, [1, 2], "B", "final", 1)).toThrow(/no held \(fixed\) species A/);
  });
});
