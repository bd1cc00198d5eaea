import fc from "fast-check";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "./analysis";
import { simulateNetwork } from "./kinetics/simulate";
import { rank } from "./linalg/kernel";
import type { SparseVector } from "./linalg/sparse";
import { buildNetwork } from "./network";
import { parseMechanism } from "./parse";
import { denseStoichiometricMatrix } from "./stoichiometry";

const fixture = (name: string) => readFileSync(new URL(`../../tests/fixtures/${name}`, import.meta.url), "utf8");

// Expected values are written from the cited sources (or worked by hand from the definitions where
// marked so): n complexes, l linkage classes, s rank, deficiency δ = n − l − s.
describe("published networks", () => {
  it("Michaelis–Menten, E + S ⇌ C → E + P (any biochemistry textbook): δ = 0, not weakly reversible", async () => {
    const report = await analyzeSource(fixture("michaelis-menten.weave"));
    expect(report.species).toEqual(["E", "S", "C", "P"]);
    expect(report.complexes).toEqual(["E + S", "C", "E + P"]);
    expect(report.reactions).toEqual([
      { from: 0, to: 1, rate: 1e6 },
      { from: 1, to: 0, rate: 100 },
      { from: 1, to: 2, rate: 10 },
    ]);
    expect(report.linkageClasses).toEqual([[0, 1, 2]]);
    expect(report.strongLinkageClasses).toEqual([[0, 1], [2]]);
    expect(report.terminalStrongLinkageClasses).toEqual([[2]]);
    expect(report.rank).toBe(2);
    expect(report.deficiency).toBe(0);
    expect(report.linkageClassDeficiencies).toEqual([0]);
    expect(report.reversible).toBe(false);
    expect(report.weaklyReversible).toBe(false);
    // Total enzyme E + C and total substrate S + C + P.
    expect(report.conservationLaws).toEqual([
      [1, 0, 1, 0],
      [0, 1, 1, 1],
    ]);
    expect(report.massConserving).toBe(true);
    // The class of [E]0 = 1e-6, [S]0 = 1e-3 (worked by hand): E + C = 1e-6 and S + C + P = 1e-3, on a plane.
    expect(report.compatibilityClass).toEqual({ dimension: 2, totals: [1e-6, 1e-3] });
    expect(report.theorems.deficiencyZero.applies).toBe(true);
    expect(report.theorems.deficiencyZero.conclusion).toMatch(/no steady state with every concentration positive/);
    expect(report.odes).toEqual({
      E: "-kon*E*S + koff*C + kcat*C",
      S: "-kon*E*S + koff*C",
      C: "kon*E*S - koff*C - kcat*C",
      P: "kcat*C",
    });
  });

  it("Lotka–Volterra, X → 2X, X + Y → 2Y, Y → 0 (Lotka 1920, Volterra 1926): δ = 1, no conservation law", async () => {
    const report = await analyzeSource(fixture("lotka-volterra.weave"));
    expect(report.complexes).toEqual(["X", "2X", "X + Y", "2Y", "Y", "0"]);
    expect(report.linkageClasses).toEqual([[0, 1], [2, 3], [4, 5]]);
    expect(report.rank).toBe(2);
    expect(report.deficiency).toBe(1);
    expect(report.linkageClassDeficiencies).toEqual([0, 0, 0]);
    expect(report.conservationLaws).toEqual([]);
    expect(report.massConserving).toBe(false);
    expect(report.theorems.deficiencyZero.applies).toBe(false);
    // Its famous periodic orbits are consistent with this: δ₁+δ₂+δ₃ = 0 ≠ δ, so the theorem is silent.
    expect(report.theorems.deficiencyOne.applies).toBe(false);
    expect(report.theorems.deficiencyOne.conclusion).toMatch(/add up to 0, not to the network's deficiency 1/);
  });

  it("Brusselator with A and B held constant (Prigogine & Lefever 1968): δ = 1, Deficiency One Theorem silent", async () => {
    const report = await analyzeSource(fixture("brusselator.weave"));
    expect(report.species).toEqual(["X", "Y"]);
    expect(report.fixedSpecies).toEqual({ A: 1, B: 3, D: 0, E: 0 });
    expect(report.complexes).toEqual(["0", "X", "2X + Y", "3X", "Y"]);
    expect(report.rank).toBe(2);
    expect(report.deficiency).toBe(1);
    expect(report.linkageClassDeficiencies).toEqual([0, 0]);
    expect(report.theorems.deficiencyOne.applies).toBe(false);
    // B + X → Y + D: rate 1 with [B] = 3 folded in.
    expect(report.reactions[2]).toEqual({ from: 1, to: 4, rate: 3 });
    expect(report.odes.X).toBe("A + X^2*Y - B*X - X");
  });

  it("Feinberg's lecture network A ⇌ 2B, A + C ⇌ D → B + E → A + C (Feinberg 1979 lectures; from memory): δ = 0, weakly reversible", async () => {
    const report = await analyzeSource("A <=> 2B @ 1, 1\nA + C <=> D @ 1, 1\nD -> B + E @ 1\nB + E -> A + C @ 1");
    expect(report.complexes).toEqual(["A", "2B", "A + C", "D", "B + E"]);
    expect(report.linkageClasses).toEqual([[0, 1], [2, 3, 4]]);
    expect(report.rank).toBe(3);
    expect(report.deficiency).toBe(0);
    expect(report.weaklyReversible).toBe(true);
    expect(report.reversible).toBe(false);
    expect(report.terminalStrongLinkageClasses).toEqual([[0, 1], [2, 3, 4]]);
    expect(report.theorems.deficiencyZero.applies).toBe(true);
    expect(report.theorems.deficiencyZero.conclusion).toMatch(/exactly one positive steady state/);
    expect(report.massConserving).toBe(true);
  });

  it("Horn & Jackson's cycle through 3A, A + 2B, 3B, 2A + B (Horn & Jackson 1972; from memory): δ = 2, weakly reversible", async () => {
    const report = await analyzeSource("3A -> A + 2B @ 1\nA + 2B -> 3B @ 1\n3B -> 2A + B @ 1\n2A + B -> 3A @ 1");
    expect(report.linkageClasses).toEqual([[0, 1, 2, 3]]);
    expect(report.rank).toBe(1);
    expect(report.deficiency).toBe(2);
    expect(report.weaklyReversible).toBe(true);
    expect(report.theorems.deficiencyZero.applies).toBe(false);
    expect(report.theorems.deficiencyOne.applies).toBe(false);
    expect(report.theorems.deficiencyOne.conclusion).toMatch(/linkage class 1 has deficiency 2/);
  });

  it("Edelstein's network A ⇌ 2A, A + B ⇌ C ⇌ B (Feinberg 2019 book; from memory): δ = 1 with bistability possible", async () => {
    const report = await analyzeSource("A <=> 2A @ 1, 1\nA + B <=> C @ 1, 1\nC <=> B @ 1, 1");
    expect(report.deficiency).toBe(1);
    expect(report.linkageClassDeficiencies).toEqual([0, 0]);
    expect(report.reversible).toBe(true);
    expect(report.conservationLaws).toEqual([[0, 1, 1]]);
    expect(report.massConserving).toBe(false);
    expect(report.theorems.deficiencyOne.applies).toBe(false);
  });

  it("Schlögl's model A + 2X ⇌ 3X, X ⇌ B with A, B fixed (Schlögl 1972): δ = 1, theorems silent, as its bistability requires", async () => {
    const report = await analyzeSource("A + 2X <=> 3X @ 1, 1\nX <=> B @ 1, 1\nfixed [A] = 1\nfixed [B] = 1");
    expect(report.species).toEqual(["X"]);
    expect(report.complexes).toEqual(["2X", "3X", "X", "0"]);
    expect(report.deficiency).toBe(1);
    expect(report.linkageClassDeficiencies).toEqual([0, 0]);
    expect(report.theorems.deficiencyZero.applies).toBe(false);
    expect(report.theorems.deficiencyOne.applies).toBe(false);
    expect(report.odes.X).toBe("A*X^2 - X^3 - X + B");
  });

  it("2A ⇌ A + B ⇌ 2B (worked by hand): δ = 1 in one linkage class, so the Deficiency One Theorem applies", async () => {
    const report = await analyzeSource("2A <=> A + B @ 1, 1\nA + B <=> 2B @ 1, 1");
    expect(report.deficiency).toBe(1);
    expect(report.linkageClassDeficiencies).toEqual([1]);
    expect(report.theorems.deficiencyZero.applies).toBe(false);
    expect(report.theorems.deficiencyOne.applies).toBe(true);
    expect(report.theorems.deficiencyOne.conclusion).toMatch(/weakly reversible.*exactly one/);
  });
});

describe("the report around errors and limits", () => {
  it("keeps every contract key and the structure of what parsed", async () => {
    const report = await analyzeSource(fixture("broken.weave"));
    expect(report.diagnostics.filter((d) => d.severity === "error").map((d) => [d.line, d.column])).toEqual([
      [1, 5],
      [4, 10],
    ]);
    expect(report.complexes).toEqual(["Y", "Z", "0"]);
    for (const key of contractKeys) expect(report).toHaveProperty(key);
  });

  it("refuses an oversized text with one diagnostic and empty structure", async () => {
    const report = await analyzeSource("A -> B\n".repeat(20_001));
    expect(report.diagnostics).toHaveLength(1);
    expect(report.species).toEqual([]);
    expect(report.theorems.deficiencyZero.applies).toBe(false);
  });

  it("describes the network that runs: A ⇌ B with k1 = 0 is B → A, not weakly reversible", async () => {
    const report = await analyzeSource("A <=> B @ k1, k2\nk1 = 0\nk2 = 1");
    expect(report.diagnostics.map((d) => [d.line, d.message])).toEqual([[1, "rate coefficient 0: forward direction left out of the network"]]);
    expect(report.reactions).toEqual([{ from: 1, to: 0, rate: 1 }]);
    expect(report).toMatchObject({ reversible: false, weaklyReversible: false, deficiency: 0 });
    expect(report.theorems.deficiencyZero.conclusion).toMatch(/no steady state with every concentration positive/);
    expect(report.odes).toEqual({ A: "k2*B", B: "-k2*B" });
    // and the simulation agrees: B decays to 0
    const { mechanism } = parseMechanism("A <=> B @ k1, k2\nk1 = 0\nk2 = 1\n[B]0 = 1");
    const run = simulateNetwork(mechanism, buildNetwork(mechanism), { until: 40, samples: 2 });
    expect(run.series.B[1]).toBeLessThan(1e-9);
  });

  it("flags custom rate laws and says the theorems cover mass action only", async () => {
    const report = await analyzeSource("S -> P @ { Vmax*S/(Km + S) }\nVmax = 1\nKm = 0.1");
    expect(report.customLaws).toEqual([{ reaction: 0, law: "Vmax*S/(Km + S)", lines: [1] }]);
    expect(report.theorems.deficiencyZero.conclusion).toMatch(/custom rate law/);
    expect(report.odes).toEqual({ S: "-Vmax*S/(Km + S)", P: "Vmax*S/(Km + S)" });
  });

  it("gives the stoichiometric matrix by sparse columns, and densely with species as rows", async () => {
    const report = await analyzeSource("X + Y -> 2Y @ 1\nY -> 0 @ 1");
    expect(report.stoichiometry).toEqual([[[0, -1], [1, 1]], [[1, -1]]]);
    expect(denseStoichiometricMatrix(report)).toEqual([
      [-1, 0],
      [1, -1],
    ]);
  });
});

const contractKeys = [
  "diagnostics", "species", "complexes", "reactions", "linkageClasses", "strongLinkageClasses",
  "terminalStrongLinkageClasses", "rank", "deficiency", "linkageClassDeficiencies", "reversible",
  "weaklyReversible", "conservationLaws", "massConserving", "theorems.deficiencyZero.applies",
  "theorems.deficiencyZero.conclusion", "theorems.deficiencyOne.applies", "theorems.deficiencyOne.conclusion", "odes",
];

describe("invariants on random mechanisms", () => {
  const species = fc.constantFrom("A", "B", "C", "D");
  const complex = fc
    .array(fc.tuple(fc.integer({ min: 1, max: 3 }), species), { maxLength: 3 })
    .map((terms) => (terms.length === 0 ? "0" : terms.map(([n, s]) => `${n}${s}`).join(" + ")));
  const step = fc.tuple(complex, fc.boolean(), complex).map(([l, rev, r]) => `${l} ${rev ? "<=>" : "->"} ${r} @ ${rev ? "1, 2" : "1"}`);

  it("0 ≤ deficiency, rank ≤ min(species, reactions), and the classes partition the complexes", async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(step, { minLength: 1, maxLength: 10 }), async (steps) => {
        const report = await analyzeSource(steps.join("\n"));
        expect(report.deficiency).toBeGreaterThanOrEqual(0);
        expect(report.rank).toBeLessThanOrEqual(Math.min(report.species.length, report.reactions.length));
        expect(report.linkageClassDeficiencies.every((d) => d >= 0)).toBe(true);
        expect(report.linkageClasses.flat().sort((a, b) => a - b)).toEqual(report.complexes.map((_, i) => i));
        expect(report.conservationLaws).toHaveLength(report.species.length - report.rank);
        // The spanning-forest shortcut loses nothing: every reaction vector counts the same rank,
        // and each conservation law is orthogonal to every column of the stoichiometric matrix.
        const matrix = denseStoichiometricMatrix(report);
        const columns = report.reactions.map((_, j) => matrix.map((row) => row[j]));
        expect(rank(columns.map(sparse))).toBe(report.rank);
        for (const law of report.conservationLaws) {
          for (const column of columns) expect(column.reduce((sum, value, i) => sum + value * law[i], 0)).toBe(0);
        }
      }),
      { numRuns: 200 },
    );
  });
});

function sparse(dense: number[]): SparseVector {
  const indices = dense.flatMap((value, index) => (value === 0 ? [] : [index]));
  return { indices, values: indices.map((index) => dense[index]) };
}
