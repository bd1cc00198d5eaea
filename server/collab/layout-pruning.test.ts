import * as Y from "yjs";
import { describe, expect, it } from "vitest";
import { stalePositions } from "./layout-pruning";

function layoutWith(keys: string[]): Y.Map<unknown> {
  const layout = new Y.Doc().getMap("layout");
  for (const key of keys) layout.set(key, { x: 0, y: 0 });
  return layout;
}

describe("stalePositions", () => {
  it("keeps positions of complexes that left the text while there are few of them", () => {
    expect(stalePositions(layoutWith(["A", "B", "X", "XY"]), ["A", "B"], 2)).toEqual([]);
  });

  it("drops every position of a complex not in the text once too many have gathered", () => {
    const stale = stalePositions(layoutWith(["A", "B", "X", "XY", "XYZ"]), ["A", "B", "C"], 2);
    expect(stale.sort()).toEqual(["X", "XY", "XYZ"]);
  });
});
