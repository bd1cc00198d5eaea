// The hub on the in-memory store: access changes from the audit trail and ended credentials
// reach open sockets, API writes and versions go through the live room, and of two instances
// holding a room only the leader analyses and compacts.
import { afterEach, describe, expect, it, vi } from "vitest";
import * as Y from "yjs";
import { analysisMap, fitsMap, MAX_FIT_NOTICES, sourceText } from "../../app/shared/room-document";
import { closeCodes, type CollabIdentity } from "./connection";
import { CollabHub } from "./hub";
import { inProcessAnalyzer, MemoryCollabStore } from "./in-memory";
import { soloBus } from "./room-bus";
import { join, TestMember } from "./test-member";

let hub: CollabHub | null = null;
afterEach(async () => {
  await hub?.close();
  hub = null;
});

function setUp(source = "A -> B @ 1\n") {
  const store = new MemoryCollabStore();
  store.addMechanism("m1", source);
  hub = new CollabHub(store, inProcessAnalyzer, { recomputeMs: 5, snapshotQuietMs: 60_000, sourceMirrorMs: 5, roleFeedMs: 10 });
  return { store, hub };
}

async function member(hub: CollabHub, identity: CollabIdentity) {
  const joined = new TestMember(identity);
  expect(await join(hub, "m1", joined)).toBe(true);
  joined.sync();
  return joined;
}

describe("the collaboration hub on the in-memory store", () => {
  it("admits nobody to a mechanism that does not exist", async () => {
    const { hub } = setUp();
    expect(await join(hub, "missing", new TestMember({ userId: "u", name: "Ada", role: "editor" }))).toBe(false);
  });

  it("applies role changes from the audit trail: lowered closes with 4001, revoked with 4403, others stay", async () => {
    const { store, hub } = setUp();
    for (const [user, role] of [["ada", "editor"], ["ben", "editor"], ["cy", "viewer"]] as const) store.setRole("m1", user, role);
    const ada = await member(hub, { userId: "ada", name: "Ada", role: "editor" });
    const ben = await member(hub, { userId: "ben", name: "Ben", role: "editor" });
    const cy = await member(hub, { userId: "cy", name: "Cy", role: "viewer" });
    // The feed began after the newest row when the hub was made (before anyone joined): these rows are new to it.
    const log = vi.spyOn(console, "log").mockImplementation(() => {});

    store.setRole("m1", "ada", "viewer");
    store.recordRoleChange({ mechanismId: "m1", userId: "ada", action: "change" });
    store.setRole("m1", "ben", null);
    store.recordRoleChange({ mechanismId: "m1", userId: "ben", action: "revoke" });
    await vi.waitFor(() => expect(ada.socket.closedWith?.code).toBe(closeCodes.roleChanged));
    await vi.waitFor(() => expect(ben.socket.closedWith?.code).toBe(closeCodes.accessRevoked));
    expect(cy.socket.closedWith).toBeNull();
    expect(log).toHaveBeenCalledTimes(2);
    log.mockRestore();
  });

  it("closes a socket with 4401 once the session or token that opened it ends", async () => {
    const { store, hub } = setUp();
    store.sessions.set("s1", "ada");
    store.tokens.add("t1");
    const bySession = await member(hub, { userId: "ada", name: "Ada", role: "editor", credential: { sessionId: "s1" } });
    const byToken = await member(hub, { userId: "ada", name: "Ada", role: "editor", credential: { tokenId: "t1" } });
    const log = vi.spyOn(console, "log").mockImplementation(() => {});

    store.sessions.delete("s1");
    await vi.waitFor(() => expect(bySession.socket.closedWith?.code).toBe(closeCodes.signedOut));
    expect(byToken.socket.closedWith).toBeNull();
    store.tokens.delete("t1");
    await vi.waitFor(() => expect(byToken.socket.closedWith?.code).toBe(closeCodes.signedOut));
    log.mockRestore();
  });

  it("writes an API text into the live document as one edit, and restores a named version", async () => {
    const { store, hub } = setUp();
    const reader = await member(hub, { userId: "vic", name: "Vic", role: "viewer" });
    const named = await hub.createNamedSnapshot("m1", "ada", "first");
    expect(named).toMatchObject({ id: expect.any(Number) });

    expect(await hub.replaceSource("m1", "X -> Y @ 3\n", "ada")).toBe(true);
    expect(store.sources.get("m1")).toBe("X -> Y @ 3\n");
    await vi.waitFor(() => expect(reader.text).toBe("X -> Y @ 3\n"));

    const restored = await hub.restoreSnapshot("m1", "ada", named!.id);
    expect(restored).not.toBeNull();
    await vi.waitFor(() => expect(reader.text).toBe("A -> B @ 1\n"));
    expect(store.snapshots.map((s) => [s.kind, s.name, s.source])).toEqual([
      ["named", "first", "A -> B @ 1\n"],
      ["restore", `Restored #${named!.id}`, "A -> B @ 1\n"],
    ]);
    expect(sourceText(reader.doc).toString()).toBe(store.sources.get("m1"));
  });
});

describe("fits in the room, on the in-memory store", () => {
  it("writes fitted values as one update everyone gets, names the version, and refuses a value the text does not declare", async () => {
    const { store, hub } = setUp("go: A -> B @ k1 = 0.5 # first guess\nback: B -> A @ k2 = 2\n[A]0 = 1\n");
    const reader = await member(hub, { userId: "vic", name: "Vic", role: "viewer" });
    await vi.waitFor(() => expect(reader.text).toContain("k1 = 0.5"));
    // The recompute writes the analysis map besides; the text changes in one transaction.
    let textChanges = 0;
    sourceText(reader.doc).observe(() => textChanges++);

    const applied = await hub.applyValues("m1", "ada", { k1: 0.25, k2: 3.5, "[A]0": 2 }, "fitted to run 1");
    expect(applied).toMatchObject({ undeclared: [], previous: { k1: 0.5, k2: 2, "[A]0": 1 }, snapshot: { id: expect.any(Number) } });
    const expected = "go: A -> B @ k1 = 0.25 # first guess\nback: B -> A @ k2 = 3.5\n[A]0 = 2\n";
    await vi.waitFor(() => expect(reader.text).toBe(expected));
    expect(textChanges).toBe(1);
    expect(store.sources.get("m1")).toBe(expected);
    expect(store.snapshots.at(-1)).toMatchObject({ kind: "named", name: "fitted to run 1", source: expected, authorId: "ada" });

    const refused = await hub.applyValues("m1", "ada", { k1: 1, nowhere: 1 }, "fitted to run 2");
    expect(refused).toMatchObject({ undeclared: ["nowhere"], snapshot: null });
    expect(store.sources.get("m1")).toBe(expected);
  });

  it("announces fits in the document's fits map and keeps only the newest notices", async () => {
    const { hub } = setUp();
    const reader = await member(hub, { userId: "vic", name: "Vic", role: "viewer" });
    for (let i = 0; i < MAX_FIT_NOTICES + 3; i++) {
      await hub.announceFit("m1", `fit-${i}`, { status: "done", at: new Date(Date.UTC(2026, 0, 1, 0, 0, i)).toISOString(), by: "Ada" });
    }
    await vi.waitFor(() => expect(fitsMap(reader.doc).size).toBe(MAX_FIT_NOTICES));
    expect(fitsMap(reader.doc).has("fit-0")).toBe(false);
    expect(fitsMap(reader.doc).get(`fit-${MAX_FIT_NOTICES + 2}`)).toMatchObject({ status: "done", by: "Ada" });
  });
});

describe("two instances holding one room, on the in-memory store", () => {
  it("leaves the upkeep to the leader, whose compaction keeps a follower's edits it never heard of", async () => {
    const store = new MemoryCollabStore();
    store.addMechanism("m1", "A -> B @ 1\n");
    const timings = { recomputeMs: 5, snapshotQuietMs: 60_000, sourceMirrorMs: 5 };
    const leaderHub = new CollabHub(store, inProcessAnalyzer, timings, soloBus("leader"));
    let followerAnalyses = 0;
    const counting = { analyze: (source: string) => (followerAnalyses++, inProcessAnalyzer.analyze(source)), stop() {} };
    // No announcements reach either hub: the leader learns of the follower's rows only by compacting.
    const followerHub = new CollabHub(store, counting, timings, { ...soloBus("follower"), tryLead: async () => false });
    const log = vi.spyOn(console, "log").mockImplementation(() => {});
    try {
      const ada = await member(leaderHub, { userId: "ada", name: "Ada", role: "editor" });
      await vi.waitFor(() => expect(analysisMap(ada.doc).get("reactions")).toBe(1));
      const ben = await member(followerHub, { userId: "ben", name: "Ben", role: "editor" });
      await vi.waitFor(() => expect(ben.text).toBe("A -> B @ 1\n"));

      ben.edit((doc) => sourceText(doc).insert(sourceText(doc).length, "C -> D @ 2\n"));
      await vi.waitFor(() => expect(replay(store.updatesOf("m1")).getText("source").toString()).toContain("C -> D"));
      expect(followerAnalyses).toBe(0);

      await leaderHub.close();
      const compacted = store.states.get("m1")!;
      expect(store.updatesOf("m1")).toEqual([]);
      expect(replay([compacted]).getText("source").toString()).toBe("A -> B @ 1\nC -> D @ 2\n");
      // The follower stores what it holds, and compacts nothing.
      await followerHub.close();
      expect(store.states.get("m1")).toBe(compacted);
      expect(followerAnalyses).toBe(0);
    } finally {
      log.mockRestore();
      await Promise.all([leaderHub.close(), followerHub.close()]);
    }
  });
});

function replay(updates: Uint8Array[]): Y.Doc {
  const doc = new Y.Doc();
  for (const update of updates) Y.applyUpdate(doc, update);
  return doc;
}
