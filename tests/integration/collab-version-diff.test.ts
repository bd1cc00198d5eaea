import { describe, expect, it } from "vitest";
import { describeInvariantChanges, diffText, type StructureSummary } from "../../app/shared/version-diff";

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
});
