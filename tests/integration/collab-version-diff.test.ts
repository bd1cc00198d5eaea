import { describe, expect, it } from "vitest";
import { analyzeSource } from "../../app/chem/analysis";
import { describeInvariantChanges, diffText, summarizeStructure, type StructureSummary } from "../../app/shared/version-diff";

const base: StructureSummary = {
  species: 2, speciesNames: ["X", "Y"], complexes: 3, reactions: 2, linkageClasses: 1,
  rank: 2, deficiency: 0, reversible: false, weaklyReversible: false, errors: 0,
};

describe("version diff", () => {
  it("numbers added, removed and kept lines on both sides", () => {
    expect(diffText("a\nb\nc\n", "a\nc\nd\n")).toEqual([
      { kind: "same", text: "a", before: 1, after: 1 },
      { kind: "removed", text: "b", before: 2, after: null },
      { kind: "same", text: "c", before: 3, after: 2 },
      { kind: "added", text: "d", before: null, after: 3 },
    ]);
  });

  it("states invariant changes in words", () => {
    const after = { ...base, deficiency: 1, linkageClasses: 2, species: 3, speciesNames: ["X", "Y", "Z"], weaklyReversible: true };
    expect(describeInvariantChanges(base, after)).toBe(
      "deficiency 0 → 1, linkage classes 1 → 2, species 2 → 3, weakly reversible no → yes, species added: Z",
    );
    expect(describeInvariantChanges(base, { ...base })).toBe("no change in the invariants");
  });

  it("states behaviour verdict changes in words, and skips them for versions stored without verdicts", () => {
    const before = { ...base, verdicts: { multistationarity: "excluded" as const, persistence: true, robust: [] } };
    const after = { ...base, verdicts: { multistationarity: "possible" as const, persistence: null, robust: ["Y"] } };
    expect(describeInvariantChanges(before, after)).toBe(
      "multistationarity excluded → possible, siphon criterion for persistence holds → undecided, robust concentrations none → Y",
    );
    expect(describeInvariantChanges(base, after)).toBe("no change in the invariants");
  });

  it("a version diff computed from two real analyses: adding a step that makes the network bistable", async () => {
    // Schlögl's model (Schlögl 1972) has three steady states for suitable coefficients; without the
    // cubic step it is linear in X and has one. A and B are held fixed.
    const linear = summarizeStructure(await analyzeSource("fixed [A] = 1\nA <=> X @ 1, 1\n"));
    const schloegl = summarizeStructure(await analyzeSource("fixed [A] = 1\nfixed [B] = 1\nA + 2X <=> 3X @ 1, 1\nX <=> B @ 1, 1\n"));
    expect(describeInvariantChanges(linear, schloegl)).toContain("multistationarity excluded → possible");
  });
});
