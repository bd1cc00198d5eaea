// The room's logic on the in-memory store with a real Yjs document and members speaking the
// Yjs protocols over recording sockets: storing before relaying, what is refused, presence, the
// analysis, compaction and unloading. The same paths run against PostgreSQL and real sockets in
// tests/integration/collab*.test.ts.
import { afterEach, describe, expect, it, vi } from "vitest";
import * as Y from "yjs";
import { analysisMap, layoutMap, sourceText } from "../../app/shared/room-document";
import { closeCodes, type CollabIdentity } from "./connection";
import { CollabHub, type HubTimings } from "./hub";
import { inProcessAnalyzer, MemoryCollabStore } from "./in-memory";
import { join, TestMember } from "./test-member";

const fast: Partial<HubTimings> = { recomputeMs: 5, snapshotQuietMs: 20, sourceMirrorMs: 5, idleUnloadMs: 60_000, roleFeedMs: 20 };
const hubs: CollabHub[] = [];

function openHub(store: MemoryCollabStore, timings: Partial<HubTimings> = {}) {
  const hub = new CollabHub(store, inProcessAnalyzer, { ...fast, ...timings });
  hubs.push(hub);
  return hub;
}

afterEach(async () => {
  await Promise.all(hubs.splice(0).map((hub) => hub.close()));
});

const editor = (name: string): CollabIdentity => ({ userId: name.toLowerCase(), name, role: "editor" });
const viewer = (name: string): CollabIdentity => ({ userId: name.toLowerCase(), name, role: "viewer" });

async function member(hub: CollabHub, mechanismId: string, identity: CollabIdentity) {
  const joined = new TestMember(identity);
  expect(await join(hub, mechanismId, joined)).toBe(true);
  joined.sync();
  return joined;
}

/** A document from stored updates, as a reload builds it. */
function replay(updates: Uint8Array[]): Y.Doc {
  const doc = new Y.Doc();
  for (const update of updates) Y.applyUpdate(doc, update);
  return doc;
}

function storeWith(source: string) {
  const store = new MemoryCollabStore();
  store.addMechanism("m1", source);
  return store;
}

describe("a room on the in-memory store", () => {
  it("stores the first document once, from the saved text, and a reload does not double it", async () => {
    const store = storeWith("A -> B @ 1\n");
    const first = await member(openHub(store), "m1", editor("Ada"));
    expect(first.text).toBe("A -> B @ 1\n");
    // Stored before anyone joined: the first row alone holds the text (the server's analysis follows).
    expect(sourceText(replay(store.updatesOf("m1").slice(0, 1))).toString()).toBe("A -> B @ 1\n");
    await hubs.pop()!.close();

    const again = await member(openHub(store), "m1", editor("Ada"));
    expect(again.text).toBe("A -> B @ 1\n");
  });

  it("relays an editor's update only once it is stored, and not back to its author", async () => {
    const store = storeWith("");
    const hub = openHub(store);
    const author = await member(hub, "m1", editor("Ada"));
    const reader = await member(hub, "m1", editor("Ben"));
    // What the store holds at the moment each relayed text change is applied by the reader.
    const storedAtRelay: string[] = [];
    sourceText(reader.doc).observe(() => storedAtRelay.push(sourceText(replay(store.updatesOf("m1"))).toString()));
    const echoes: string[] = [];
    sourceText(author.doc).observe((event) => event.transaction.origin === "server" && echoes.push(author.text));

    author.edit((doc) => sourceText(doc).insert(0, "X -> Y @ 2\n"));
    await vi.waitFor(() => expect(reader.text).toBe("X -> Y @ 2\n"));
    expect(storedAtRelay).toEqual(["X -> Y @ 2\n"]);
    expect(echoes).toEqual([]);
  });

  it("drops a viewer's edits, refuses an editor's NUL with a reason and keeps both connections open", async () => {
    const store = storeWith("A -> B\n");
    const hub = openHub(store);
    const watcher = await member(hub, "m1", viewer("Vic"));
    const writer = await member(hub, "m1", editor("Ada"));
    const stored = store.updatesOf("m1").length;
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});

    watcher.edit((doc) => sourceText(doc).insert(0, "junk "));
    writer.edit((doc) => sourceText(doc).insert(0, "B\0"));
    await vi.waitFor(() => expect(writer.refusals).toEqual(["nul-character"]));
    expect(warn.mock.calls.map(([line]) => String(line))).toEqual([
      expect.stringContaining("dropped document update (update) #1 from Vic"),
      expect.stringContaining("refused update #1 (nul-character) from Ada"),
    ]);
    warn.mockRestore();

    const fresh = await member(hub, "m1", editor("Cy"));
    expect(fresh.text).toBe("A -> B\n");
    expect(store.updatesOf("m1")).toHaveLength(stored);
    expect(watcher.socket.closedWith).toBeNull();
    expect(writer.socket.closedWith).toBeNull();
  });

  it("refuses a layout value that is not a position, and takes one that is", async () => {
    const hub = openHub(storeWith("A -> B\n"));
    const writer = await member(hub, "m1", editor("Ada"));
    const reader = await member(hub, "m1", viewer("Vic"));
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    writer.edit((doc) => layoutMap(doc).set("A", { x: 1, y: "2" }));
    await vi.waitFor(() => expect(writer.refusals).toEqual(["shape"]));
    warn.mockRestore();

    const second = await member(hub, "m1", editor("Ben"));
    second.edit((doc) => layoutMap(doc).set("A", { x: 1, y: 2 }));
    await vi.waitFor(() => expect(layoutMap(reader.doc).get("A")).toEqual({ x: 1, y: 2 }));
  });

  it("writes the analysis of the text into the analysis map and mirrors the text into the mechanism", async () => {
    const store = storeWith("");
    const hub = openHub(store);
    const writer = await member(hub, "m1", editor("Ada"));
    writer.edit((doc) => sourceText(doc).insert(0, "A + B <=> C @ 1, 2\n"));
    await vi.waitFor(() => expect(analysisMap(writer.doc).get("complexes")).toBe(2));
    expect(analysisMap(writer.doc).get("report")).toBeInstanceOf(Uint8Array);
    await vi.waitFor(() => expect(store.sources.get("m1")).toBe("A + B <=> C @ 1, 2\n"));
    // The settled structure becomes an automatic version after the quiet period.
    await vi.waitFor(() => expect(store.snapshots.map((s) => s.kind)).toEqual(["auto"]));
  });

  it("stamps presence with the member's name and role, and lets nobody speak for another member's client", async () => {
    const hub = openHub(storeWith(""));
    const ada = await member(hub, "m1", editor("Ada"));
    const vic = await member(hub, "m1", viewer("Vic"));
    const adaClient = ada.doc.clientID;

    ada.publish({ user: { name: "Someone else", colour: "#236cc1" } });
    await vi.waitFor(() => expect(vic.presenceOf(adaClient)).toEqual({ user: { name: "Ada", colour: "#236cc1", role: "editor" } }));
    vic.publish({ user: { name: "Vic" }, graphDrag: "A" }, adaClient, 2);
    vic.publish({ user: { name: "Vic" } });
    await vi.waitFor(() => expect(ada.presenceOf(vic.doc.clientID)).toBeDefined());
    expect(ada.presenceOf(adaClient)).toBeUndefined();
    expect(vic.presenceOf(adaClient)?.graphDrag).toBeUndefined();

    ada.socket.close(1000, "bye");
    await vi.waitFor(() => expect(vic.presenceOf(adaClient)).toBeUndefined());
  });

  it("lets one connection speak for at most four presence clients", async () => {
    const hub = openHub(storeWith(""));
    const ada = await member(hub, "m1", editor("Ada"));
    const vic = await member(hub, "m1", viewer("Vic"));
    for (const clientId of [101, 102, 103, 104, 105]) ada.publish({ user: { name: "Ada" } }, clientId);
    await vi.waitFor(() => expect(vic.presenceOf(104)).toBeDefined());
    expect(vic.presenceOf(105)).toBeUndefined();
  });

  it("compacts the log after the configured number of updates, losing no edit", async () => {
    const store = storeWith("");
    const hub = openHub(store, { compactEvery: 5 });
    const writer = await member(hub, "m1", editor("Ada"));
    for (let i = 0; i < 7; i++) writer.edit((doc) => sourceText(doc).insert(0, "x"));
    await vi.waitFor(() => expect(store.states.has("m1")).toBe(true));
    await vi.waitFor(() => expect(store.updatesOf("m1").length).toBeLessThan(5));

    const stored = await store.loadDocument("m1");
    const reloaded = replay([stored.state!, ...stored.updates]);
    await vi.waitFor(() => expect(sourceText(reloaded).toString()).toBe("xxxxxxx"));
  });

  it("unloads a room left idle: text mirrored, the last analysis and every edit in one compacted state", async () => {
    const store = storeWith("");
    const hub = openHub(store, { idleUnloadMs: 10 });
    const writer = await member(hub, "m1", editor("Ada"));
    writer.edit((doc) => sourceText(doc).insert(0, "A -> 2 B @ 1\n"));
    writer.socket.close(1000, "bye");
    await vi.waitFor(() => expect(store.updatesOf("m1")).toHaveLength(0));

    const reloaded = replay([store.states.get("m1")!]);
    expect(sourceText(reloaded).toString()).toBe("A -> 2 B @ 1\n");
    expect(analysisMap(reloaded).get("species")).toBe(2);
    expect(store.sources.get("m1")).toBe("A -> 2 B @ 1\n");
  });

  it("closes every member with 4404 when the mechanism is deleted under the room", async () => {
    const store = storeWith("A -> B\n");
    const hub = openHub(store);
    const writer = await member(hub, "m1", editor("Ada"));
    const reader = await member(hub, "m1", viewer("Vic"));
    store.deleteMechanism("m1");
    writer.edit((doc) => sourceText(doc).insert(0, "C -> D\n"));
    await vi.waitFor(() => expect(reader.socket.closedWith?.code).toBe(closeCodes.mechanismGone));
    expect(writer.socket.closedWith?.code).toBe(closeCodes.mechanismGone);
  });
});
