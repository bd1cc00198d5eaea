import { describe, expect, it } from "vitest";
import * as Y from "yjs";
import { MAX_LAYOUT_KEYS } from "../../app/shared/room-document";
import { UpdateCheck } from "./update-check";

/** A server document holding some text and analysis; each edit is made on a fresh synced copy. */
function room() {
  const server = new Y.Doc();
  server.getText("source").insert(0, "A -> B\n");
  server.getMap("analysis").set("deficiency", 0);
  const check = new UpdateCheck(server);
  /** Why the server refuses the update `edit` makes; an accepted one is applied. */
  const refusal = (edit: (doc: Y.Doc) => void) => {
    const client = new Y.Doc();
    Y.applyUpdate(client, Y.encodeStateAsUpdate(server));
    const before = Y.encodeStateVector(client);
    edit(client);
    const update = Y.encodeStateAsUpdate(client, before);
    const reason = check.refusal(update);
    if (reason === null) Y.applyUpdate(server, update);
    return reason;
  };
  return { server, check, refusal };
}

describe("UpdateCheck", () => {
  it("accepts typing, deleting and positions", () => {
    const { refusal } = room();
    expect(refusal((doc) => doc.getText("source").insert(7, "B -> C\n"))).toBeNull();
    expect(refusal((doc) => doc.getText("source").insert(3, "x"))).toBeNull();
    expect(refusal((doc) => doc.getText("source").delete(0, 4))).toBeNull();
    expect(refusal((doc) => doc.getMap("layout").set("A", { x: 10, y: -4 }))).toBeNull();
  });

  it("refuses other top-level types, nested types and writes to the analysis or the fit notices", () => {
    const { refusal } = room();
    expect(refusal((doc) => doc.getMap("fits").set("forged", { status: "done", at: "2026-01-01T00:00:00Z", by: "nobody" }))).toBe("shape");
    expect(refusal((doc) => doc.getText("junk").insert(0, "x".repeat(1000)))).toBe("shape");
    expect(refusal((doc) => doc.getArray("list").push([1]))).toBe("shape");
    expect(refusal((doc) => doc.getMap("layout").set("A", new Y.Map()))).toBe("shape");
    expect(refusal((doc) => doc.getMap("analysis").set("deficiency", 99))).toBe("shape");
    expect(refusal((doc) => doc.getMap("analysis").set("new", 1))).toBe("shape");
    expect(refusal((doc) => doc.getText("source").format(0, 2, { bold: true }))).toBe("shape");
    // Deleted at once, yet still naming a type of its own.
    expect(
      refusal((doc) =>
        doc.transact(() => {
          const junk = doc.getText("x".repeat(100_000));
          junk.insert(0, "gone");
          junk.delete(0, 4);
        }),
      ),
    ).toBe("shape");
  });

  it("refuses layout values that are not positions of finite numbers, long keys and too many keys", () => {
    const { refusal, server } = room();
    expect(refusal((doc) => doc.getMap("layout").set("A", { x: 1, y: "2" }))).toBe("shape");
    expect(refusal((doc) => doc.getMap("layout").set("A", { x: 1, y: 2, blob: "x" }))).toBe("shape");
    expect(refusal((doc) => doc.getMap("layout").set("A", "x".repeat(100_000)))).toBe("shape");
    expect(refusal((doc) => doc.getMap("layout").set("x".repeat(300), { x: 1, y: 2 }))).toBe("shape");
    const layout = server.getMap("layout");
    server.transact(() => {
      for (let i = 0; i < MAX_LAYOUT_KEYS; i++) layout.set(`S${i}`, { x: i, y: 0 });
    });
    expect(refusal((doc) => doc.getMap("layout").set("S1", { x: 5, y: 5 }))).toBeNull();
    expect(refusal((doc) => doc.getMap("layout").set("Fresh", { x: 5, y: 5 }))).toBe("shape");
  });

  it("refuses NUL in the text", () => {
    const { refusal } = room();
    expect(refusal((doc) => doc.getText("source").insert(0, "A\0B"))).toBe("nul-character");
  });

  it("refuses an update that builds on one the server never applied", () => {
    const { server, check } = room();
    const client = new Y.Doc();
    Y.applyUpdate(client, Y.encodeStateAsUpdate(server));
    client.getText("source").insert(0, "refused paste ");
    const before = Y.encodeStateVector(client);
    client.getText("source").insert(3, "later typing");
    expect(check.refusal(Y.encodeStateAsUpdate(client, before))).toBe("out-of-step");
  });

  it("follows long chains of origins inside one update without recursion", () => {
    const { refusal } = room();
    // Alternating ends keep the items from merging into one.
    expect(
      refusal((doc) => {
        const text = doc.getText("source");
        for (let i = 0; i < 20_000; i++) text.insert(i % 2 === 0 ? text.length : 0, "x");
      }),
    ).toBeNull();
  });
});
