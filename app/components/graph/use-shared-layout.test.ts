import { describe, expect, it } from "vitest";
import * as Y from "yjs";
import { readPositions } from "./use-shared-layout";

describe("reading the shared layout", () => {
  it("keeps points and ignores anything else a client may have written", () => {
    const layout = new Y.Doc().getMap<unknown>("layout");
    layout.set("X + Y", { x: 10, y: 20 });
    layout.set("0", { x: -5, y: 0 });
    layout.set("2Y", { x: "10", y: 20 });
    layout.set("Z", null);
    layout.set("W", { x: Number.NaN, y: 1 });
    expect(readPositions(layout)).toEqual({ "X + Y": { x: 10, y: 20 }, "0": { x: -5, y: 0 } });
  });
});
