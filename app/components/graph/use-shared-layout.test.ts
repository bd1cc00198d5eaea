import { describe, expect, it } from "vitest";
import * as Y from "yjs";
import { MAX_LAYOUT_KEY_CHARS, MAX_LAYOUT_KEYS } from "~/shared/room-document";
import { readPositions, writePositions } from "./use-shared-layout";

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

describe("writing the shared layout", () => {
  it("skips what the server would refuse: positions that are not finite, long keys, keys beyond the bound", () => {
    const layout = new Y.Doc().getMap<unknown>("layout");
    writePositions(layout, { A: { x: 1.4, y: 2.6 }, B: { x: Number.NaN, y: 0 }, ["C".repeat(MAX_LAYOUT_KEY_CHARS + 1)]: { x: 0, y: 0 } });
    expect(layout.toJSON()).toEqual({ A: { x: 1, y: 3 } });
    writePositions(layout, Object.fromEntries(Array.from({ length: MAX_LAYOUT_KEYS + 10 }, (_, i) => [`S${i}`, { x: i, y: 0 }])));
    expect(layout.size).toBe(MAX_LAYOUT_KEYS);
    writePositions(layout, { A: { x: 7, y: 7 } });
    expect(layout.get("A")).toEqual({ x: 7, y: 7 });
  });
});
