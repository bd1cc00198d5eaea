import * as Y from "yjs";
import { describe, expect, it } from "vitest";
import { layoutPosition, readPresence, rootKeys, sourceText, stampPresence, writtenLayoutPosition } from "./room-document";

describe("the room document's schema", () => {
  it("names each root type by the type itself", () => {
    const doc = new Y.Doc();
    expect(rootKeys(doc).get(sourceText(doc))).toBe("source");
    expect([...rootKeys(doc).values()]).toEqual(["source", "analysis", "layout", "fits"]);
  });

  it("takes a position of finite numbers; an editor may write exactly { x, y }", () => {
    expect(layoutPosition.safeParse({ x: 1, y: -2, note: "old" }).data).toEqual({ x: 1, y: -2 });
    expect(layoutPosition.safeParse({ x: Infinity, y: 0 }).success).toBe(false);
    expect(writtenLayoutPosition.safeParse({ x: 1, y: 2 }).success).toBe(true);
    expect(writtenLayoutPosition.safeParse({ x: 1, y: 2, note: "x" }).success).toBe(false);
    expect(writtenLayoutPosition.safeParse({ x: 1, y: "2" }).success).toBe(false);
  });

  it("reads each presence field on its own, so one malformed field loses only itself", () => {
    expect(readPresence({ user: { name: "Ada", colour: "#236cc1", role: "editor", color: "#236cc1" }, graphDrag: "2A" })).toEqual({
      user: { name: "Ada", colour: "#236cc1", role: "editor", color: "#236cc1" },
      graphDrag: "2A",
    });
    expect(readPresence({ user: { name: "" }, graphDrag: 7 })).toEqual({ user: undefined, graphDrag: null });
    expect(readPresence({ user: { name: "Ada", role: "admin" }, graphDrag: "B" })).toEqual({ user: { name: "Ada", role: undefined }, graphDrag: "B" });
  });

  it("stamps the speaker's name and role over what the client claimed, keeping the rest", () => {
    expect(stampPresence({ user: { name: "Someone", colour: "#b94548" }, cursor: 3 }, { name: "Ada", role: "viewer" })).toEqual({
      user: { name: "Ada", colour: "#b94548", role: "viewer" },
      cursor: 3,
    });
    expect(stampPresence({ user: "junk" }, { name: "Ada", role: "editor" })).toEqual({ user: { name: "Ada", role: "editor" } });
  });
});
