import { describe, expect, it } from "vitest";
import { selectionRanges } from "./selection-ranges";

const source = "X <=> 2X @ 1, 2\nX + Y -> 2Y @ 3\nX <=> 2X @ 4, 5\nY -> 0 @ 6\n";
const textOf = (ranges: { from: number; to: number }[]) => ranges.map(({ from, to }) => source.slice(from, to));

describe("text behind a graph element", () => {
  it("is every step a merged reaction came from", () => {
    expect(textOf(selectionRanges(source, { kind: "reaction", index: 0 }))).toEqual(["X <=> 2X @ 1, 2", "X <=> 2X @ 4, 5"]);
  });

  it("is every step a complex takes part in", () => {
    // Complexes in order of first appearance: X, 2X, X + Y, 2Y, Y, 0.
    expect(textOf(selectionRanges(source, { kind: "complex", index: 4 }))).toEqual(["Y -> 0 @ 6"]);
    expect(textOf(selectionRanges(source, { kind: "complex", index: 3 }))).toEqual(["X + Y -> 2Y @ 3"]);
  });

  it("is nothing for an index the text no longer has", () => {
    expect(selectionRanges(source, { kind: "reaction", index: 99 })).toEqual([]);
  });
});
