// One room served by two app instances on one database: real server processes, real PostgreSQL,
// real y-websocket clients. Members on either instance see one document; only the leader
// analyses; kill -9 of the leader hands the room on without losing an acknowledged edit; an
// access change made through one instance closes sockets on the other; a fit announced and applied
// through one instance reaches members on the other.
import fc from "fast-check";
import * as Y from "yjs";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { collabUrl, eventually, joinRoom, storedDocument, typeAtRandom, type RoomClient } from "../support/collab-client";
import { addMember, createMechanism, memberUserId, signUp, type Client } from "../support/http";
import { startInstance, startTestServer, type TestServer } from "../support/server";

// Access changes must arrive by NOTIFY: the timers that would also find them are set far beyond
// any wait here. Compaction runs often, under followers reading by row id.
const settings = { COLLAB_ROLE_FEED_MS: "600000", COLLAB_ROLE_SWEEP_MS: "600000", COLLAB_LEADER_RETRY_MS: "200", COLLAB_COMPACT_EVERY: "25" };

let first: Awaited<ReturnType<typeof startTestServer>>;
let second: TestServer;
const open: RoomClient[] = [];
// Two server processes start one after the other (each applies migrations to an empty database).
beforeAll(async () => {
  first = await startTestServer(settings);
  second = await startInstance(first.databaseUrl, settings);
}, 300_000);
afterEach(() => {
  for (const client of open.splice(0)) client.close();
});
afterAll(async () => {
  await second?.stop();
  await first?.dispose();
});

function join(server: TestServer, client: Client, id: string): RoomClient {
  const room = joinRoom(server.url, id, client.cookieHeader);
  open.push(room);
  return room;
}

/** Yjs clients that wrote into the document other than the members' own: the servers' documents. */
function serverWriters(doc: Y.Doc, members: RoomClient[]): number[] {
  const own = new Set([0, ...members.map((m) => m.doc.clientID)]);
  return [...doc.store.clients.keys()].filter((client) => !own.has(client));
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("a room across two instances", () => {
  it("/healthz names each instance", async () => {
    const [a, b] = await Promise.all([first, second].map(async (s) => (await fetch(`${s.url}/healthz`)).json() as Promise<{ ok: boolean; db: string; instance: string }>));
    expect(a).toMatchObject({ ok: true, db: "up" });
    expect(b).toMatchObject({ ok: true, db: "up" });
    expect(a.instance).not.toBe(b.instance);
  });

  it("converges: random edits on both instances, with members reconnecting to either, end in one text, the stored one", async () => {
    const owner = await signUp(first.url, "Instances Owner");
    const id = await createMechanism(owner, "A -> B @ 1\n", "Across instances");
    const editor = await addMember(owner, id, "editor", "Instances Editor");
    const servers = [first, second];
    const rooms = [join(first, owner, id), join(second, editor, id), join(second, owner, id), join(first, editor, id)];
    await Promise.all(rooms.map((r) => r.synced));

    const step = fc.record({
      who: fc.integer({ min: 0, max: 3 }),
      at: fc.double({ min: 0, max: 1, noNaN: true }),
      insert: fc.boolean(),
      text: fc.string({ minLength: 1, maxLength: 5 }),
      reconnect: fc.integer({ min: 0, max: 9 }).map((n) => n === 0),
      pause: fc.integer({ min: 0, max: 3 }),
    });
    await fc.assert(
      fc.asyncProperty(fc.array(step, { minLength: 1, maxLength: 25 }), async (steps) => {
        for (const s of steps) {
          const room = rooms[s.who];
          if (s.reconnect) {
            // Behind a load balancer the next connection may land on the other instance.
            room.provider.disconnect();
            room.provider.serverUrl = collabUrl(servers[Math.floor(s.at * 2) % 2].url);
            room.provider.connect();
          }
          const at = Math.floor(s.at * (room.text.length + 1));
          if (s.insert || room.text.length === 0) room.text.insert(at, s.text);
          else room.text.delete(Math.min(at, room.text.length - 1), 1);
          if (s.pause) await sleep(s.pause);
        }
        await eventually("every member to hold one text", () => rooms.every((r) => r.provider.synced && r.text.toString() === rooms[0].text.toString()), 20_000);
        await eventually("the stored text to match", async () => (await storedDocument(first.databaseUrl, id)).getText("source").toString() === rooms[0].text.toString(), 20_000);
      }),
      { numRuns: 12 },
    );
  }, 300_000);

  it("analyses once per change: only the leader writes the analysis", async () => {
    const owner = await signUp(first.url, "Leader Owner");
    const id = await createMechanism(owner, "A -> B @ 1\n", "Across instances");
    const editor = await addMember(owner, id, "editor", "Follower Editor");
    // The first instance loads the room first and so leads it.
    const atFirst = join(first, owner, id);
    await atFirst.synced;
    await eventually("the first analysis", () => atFirst.analysis.get("reactions") === 1);
    const atSecond = join(second, editor, id);
    await atSecond.synced;
    const revision = atFirst.analysis.get("revision") as number;

    const lines = ["B -> C @ 2\n", "C -> D @ 3\n", "D -> E @ 4\n", "E -> F @ 5\n"];
    for (const [n, line] of lines.entries()) {
      const author = n % 2 === 0 ? atSecond : atFirst;
      author.text.insert(author.text.length, line);
      for (const room of [atFirst, atSecond]) await eventually(`the analysis of change ${n + 1}`, () => room.analysis.get("reactions") === n + 2, 15_000);
    }
    expect(atSecond.analysis.get("revision")).toBe(revision + lines.length);
    expect(serverWriters(atSecond.doc, [atFirst, atSecond])).toHaveLength(1);
    expect(first.logs()).toMatch(new RegExp(`leads ${id}`));
    expect(second.logs()).not.toMatch(new RegExp(`leads ${id}`));
  }, 120_000);

  it("closes a socket on the second instance when the role changes through the first", async () => {
    const owner = await signUp(first.url, "Revoking Owner");
    const id = await createMechanism(owner, "A -> B\n", "Across instances");
    const leaver = await addMember(owner, id, "editor", "Leaving Editor");
    const lowered = await addMember(owner, id, "editor", "Lowered Editor");
    const leaverRoom = join(second, leaver, id);
    const loweredRoom = join(second, lowered, id);
    await Promise.all([leaverRoom.synced, loweredRoom.synced]);

    const closed = new Promise<number>((resolve) => leaverRoom.provider.on("closed", (event: { code: number }) => resolve(event.code)));
    await owner.post(`/m/${id}/members`, { intent: "remove", userId: await memberUserId(owner, id, leaver.email) });
    expect(await closed).toBe(4403);

    const reconnecting = new Promise<number | undefined>((resolve) => loweredRoom.provider.on("connection-close", (event: CloseEvent | null) => resolve(event?.code)));
    await owner.post(`/m/${id}/members`, { intent: "change", userId: await memberUserId(owner, id, lowered.email), role: "viewer" });
    expect(await reconnecting).toBe(4001);
  }, 60_000);

  // Last: it kills the first instance.
  it("shows a fit run and applied through the first instance to a member on the second", async () => {
    const owner = await signUp(first.url, "Fitting Owner");
    const id = await createMechanism(owner, "go: A -> B @ k1 = 0.3\n[A]0 = 1\n", "Fit across instances");
    const watcher = join(second, owner, id);
    await watcher.synced;
    const csv = "time,A\n" + [0, 1, 2, 3, 4, 5].map((t) => `${t},${Math.exp(-0.5 * t).toPrecision(8)}`).join("\n") + "\n";
    const response = await owner.json(`/api/v1/mechanisms/${id}/fits`, "POST", { data: [{ name: "decay", csv }], vary: ["k1"] });
    expect(response.status).toBe(200);
    const { id: fitId } = await response.json();
    const notices = watcher.doc.getMap("fits");
    await eventually("the finished fit's notice on the second instance", () => (notices.get(fitId) as { status?: string } | undefined)?.status === "done", 15_000);
    expect((await owner.request(`/api/v1/mechanisms/${id}/fits/${fitId}/apply`, { method: "POST" })).status).toBe(201);
    await eventually("the fitted value in the second instance's text", () => /k1 = 0\.5\d*\n/.test(watcher.text.toString()), 15_000);
  }, 60_000);

  it("hands the room to the other instance when its leader is killed, losing no acknowledged edit", async () => {
    const owner = await signUp(first.url, "Crashing Owner");
    const id = await createMechanism(owner, "A -> B @ 1\n", "Across instances");
    const witnessUser = await addMember(owner, id, "viewer", "Crash Witness");
    const typist = join(first, owner, id);
    await typist.synced;
    await eventually("the first analysis", () => typist.analysis.get("reactions") === 1);
    const witness = join(second, witnessUser, id);
    await witness.synced;

    let typing = true;
    const typed = typeAtRandom(typist.text, () => typing);
    const grown = witness.text.length + 30 + Math.floor(Math.random() * 30);
    await eventually("typing acknowledged to the witness on the other instance", () => witness.text.length >= grown, 30_000);
    await first.crash();
    typing = false;
    expect(await typed).toBeGreaterThan(30);

    // What the witness received crossed instances only after it was stored.
    const acknowledged = Y.encodeStateAsUpdate(witness.doc);
    const stored = await storedDocument(first.databaseUrl, id);
    const storedText = stored.getText("source").toString();
    Y.applyUpdate(stored, acknowledged);
    expect(stored.getText("source").toString()).toBe(storedText);

    // The second instance leads now: an edit there is analysed.
    const owned = join(second, owner, id);
    await owned.synced;
    owned.text.delete(0, owned.text.length);
    owned.text.insert(0, "P -> Q @ 1\nQ -> R @ 2\nR -> S @ 3\n");
    await eventually("an analysis by the new leader", () => witness.analysis.get("reactions") === 3, 15_000);
    expect(second.logs()).toMatch(new RegExp(`leads ${id}`));
  }, 120_000);
});
