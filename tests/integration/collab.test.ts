// The collaboration server end to end: real server process, real PostgreSQL, real y-websocket
// clients signed in by cookie.
import fc from "fast-check";
import pg from "pg";
import * as decoding from "lib0/decoding";
import * as encoding from "lib0/encoding";
import * as awarenessProtocol from "y-protocols/awareness";
import * as Y from "yjs";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { type RoomEquations, roomAnalysisReader, unpack } from "../../app/shared/analysis-map";
import { eventually, joinRoom, rawSocket, storedDocument, type RoomClient } from "../support/collab-client";
import { addMember, Client, createMechanism, memberUserId, signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
const open: RoomClient[] = [];
beforeAll(async () => {
  server = await startTestServer();
});
// Each provider holds a process exit listener until closed: rooms close with their test, so the
// file never holds more than one test's rooms (and Node does not warn of a leak).
afterEach(() => {
  for (const client of open.splice(0)) client.close();
});
afterAll(() => server?.dispose());

function join(client: Client, id: string): RoomClient {
  const room = joinRoom(server.url, id, client.cookieHeader);
  open.push(room);
  return room;
}

/** An outer awareness message (type 1) from `client` for one awareness client id, with `states`. */
function encodeAwareness(client: RoomClient, clientId: number, states: Map<number, Record<string, unknown>>): Uint8Array {
  const message = encoding.createEncoder();
  encoding.writeVarUint(message, 1);
  encoding.writeVarUint8Array(message, awarenessProtocol.encodeAwarenessUpdate(client.provider.awareness, [clientId], states));
  return encoding.toUint8Array(message);
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("live co-editing", () => {
  it("converges: concurrent random edits by three editors end in one text, the one the server stored", async () => {
    const owner = await signUp(server.url, "Converging Owner");
    const id = await createMechanism(owner, "A -> B @ 1\n");
    const others = await Promise.all([addMember(owner, id, "editor", "Editor One"), addMember(owner, id, "editor", "Editor Two")]);
    const rooms = [owner, ...others].map((c) => join(c, id));
    await Promise.all(rooms.map((r) => r.synced));

    const edit = fc.record({
      who: fc.integer({ min: 0, max: 2 }),
      at: fc.double({ min: 0, max: 1, noNaN: true }),
      insert: fc.boolean(),
      text: fc.string({ minLength: 1, maxLength: 6 }),
      pause: fc.integer({ min: 0, max: 3 }),
    });
    await fc.assert(
      fc.asyncProperty(fc.array(edit, { minLength: 1, maxLength: 30 }), async (edits) => {
        for (const e of edits) {
          const text = rooms[e.who].text;
          const at = Math.floor(e.at * text.length);
          if (e.insert || text.length === 0) text.insert(at, e.text);
          else text.delete(at, Math.min(e.text.length, text.length - at));
          if (e.pause) await sleep(e.pause);
        }
        await eventually("the three texts to agree", () => rooms.every((r) => r.text.toString() === rooms[0].text.toString()));
        const stored = await storedDocument(server.databaseUrl, id);
        expect(stored.getText("source").toString()).toBe(rooms[0].text.toString());
      }),
      { numRuns: 8 },
    );
  });

  it("refuses the upgrade to strangers, signed-out callers and unknown mechanisms", async () => {
    const owner = await signUp(server.url, "Private Owner");
    const id = await createMechanism(owner, "X -> Y\n");
    const stranger = await signUp(server.url, "Stranger");
    expect(await rawSocket(server.url, id, stranger.cookieHeader)).toEqual({ refused: 404 });
    expect(await rawSocket(server.url, id, "")).toEqual({ refused: 401 });
    expect(await rawSocket(server.url, "nosuchmechanism", owner.cookieHeader)).toEqual({ refused: 404 });
    const allowed = await rawSocket(server.url, id, owner.cookieHeader);
    expect("socket" in allowed).toBe(true);
    if ("socket" in allowed) allowed.socket.close();
  });

  it("gives viewers the document but drops every update they send", async () => {
    const owner = await signUp(server.url, "Teaching Owner");
    const id = await createMechanism(owner, "S -> P @ 2\n");
    const viewer = await addMember(owner, id, "viewer", "Curious Viewer");
    const editorRoom = join(owner, id);
    const viewerRoom = join(viewer, id);
    await Promise.all([editorRoom.synced, viewerRoom.synced]);
    expect(viewerRoom.text.toString()).toBe("S -> P @ 2\n");

    // An honest client's local edit, and a crafted socket speaking the protocol directly.
    viewerRoom.text.insert(0, "# vandalism\n");
    const raw = await rawSocket(server.url, id, viewer.cookieHeader);
    if (!("socket" in raw)) throw new Error(`viewer refused: ${raw.refused}`);
    const local = new Y.Doc();
    const firstState = new Promise<void>((resolve) =>
      raw.socket.on("message", (data: Buffer) => {
        const decoder = decoding.createDecoder(new Uint8Array(data));
        if (decoding.readVarUint(decoder) !== 0 || decoding.readVarUint(decoder) !== 1) return;
        Y.applyUpdate(local, decoding.readVarUint8Array(decoder));
        resolve();
      }),
    );
    const step1 = encoding.createEncoder();
    encoding.writeVarUint(step1, 0);
    encoding.writeVarUint(step1, 0);
    encoding.writeVarUint8Array(step1, Y.encodeStateVector(local));
    raw.socket.send(encoding.toUint8Array(step1));
    await firstState;
    const before = Y.encodeStateVector(local);
    local.getText("source").insert(0, "# crafted\n");
    local.getMap("analysis").set("deficiency", 99);
    for (const innerType of [1, 2]) {
      const message = encoding.createEncoder();
      encoding.writeVarUint(message, 0);
      encoding.writeVarUint(message, innerType);
      encoding.writeVarUint8Array(message, Y.encodeStateAsUpdate(local, before));
      raw.socket.send(encoding.toUint8Array(message));
    }
    // Each connection logs its first dropped update; both have been heard once both lines are there.
    await eventually("both viewer connections' updates dropped", () => server.logs().split("#1 from Curious Viewer").length === 3);
    raw.socket.close();

    expect(editorRoom.text.toString()).toBe("S -> P @ 2\n");
    expect(editorRoom.analysis.get("deficiency")).not.toBe(99);
    const stored = await storedDocument(server.databaseUrl, id);
    expect(stored.getText("source").toString()).toBe("S -> P @ 2\n");
    expect(server.logs()).toContain("dropped document update");
  });

  it("applies a revoked or lowered role at once", async () => {
    const owner = await signUp(server.url, "Strict Owner");
    const id = await createMechanism(owner, "A -> B\n");
    const editor = await addMember(owner, id, "editor", "Soon Viewer");
    const leaver = await addMember(owner, id, "editor", "Soon Gone");
    const ownerRoom = join(owner, id);
    const editorRoom = join(editor, id);
    const leaverRoom = join(leaver, id);
    await Promise.all([ownerRoom.synced, editorRoom.synced, leaverRoom.synced]);

    editorRoom.text.insert(editorRoom.text.length, "B -> C\n");
    await eventually("the editor's line to arrive", () => ownerRoom.text.toString().includes("B -> C"));

    const closed = new Promise<number>((resolve) => leaverRoom.provider.on("closed", (event: { code: number }) => resolve(event.code)));
    await owner.post(`/m/${id}/members`, { intent: "remove", userId: await memberUserId(owner, id, leaver.email) });
    expect(await closed).toBe(4403);
    expect(await rawSocket(server.url, id, leaver.cookieHeader)).toEqual({ refused: 404 });

    const lowered = new Promise<number | undefined>((resolve) => editorRoom.provider.on("connection-close", (event: CloseEvent | null) => resolve(event?.code)));
    await owner.post(`/m/${id}/members`, { intent: "change", userId: await memberUserId(owner, id, editor.email), role: "viewer" });
    expect(await lowered).toBe(4001);
    await eventually("the lowered editor to reconnect", () => editorRoom.provider.synced && editorRoom.provider.wsconnected);
    editorRoom.text.insert(0, "# after the change\n");
    leaverRoom.text.insert(0, "# after removal\n");
    // The removed member's provider stays closed; the lowered one's update is heard and dropped.
    expect(leaverRoom.provider.wsconnected).toBe(false);
    await eventually("the lowered editor's update dropped", () => server.logs().includes("#1 from Soon Viewer"));
    expect(ownerRoom.text.toString()).toBe("A -> B\nB -> C\n");
    expect((await storedDocument(server.databaseUrl, id)).getText("source").toString()).toBe("A -> B\nB -> C\n");
  });

  it("shares presence under the name and role the server knows, never another client's", async () => {
    const owner = await signUp(server.url, "Real Owner");
    const id = await createMechanism(owner, "A -> B\n");
    const viewer = await addMember(owner, id, "viewer", "Real Viewer");
    const ownerRoom = join(owner, id);
    const viewerRoom = join(viewer, id);
    await Promise.all([ownerRoom.synced, viewerRoom.synced]);
    viewerRoom.provider.awareness.setLocalStateField("user", { name: "Real Owner", colour: "#236cc1", role: "owner" });
    viewerRoom.provider.awareness.setLocalStateField("cursor", { anchor: 1, head: 1 });
    const seen = () => ownerRoom.provider.awareness.getStates().get(viewerRoom.doc.clientID) as { user?: { name: string; role: string; colour: string }; cursor?: unknown } | undefined;
    await eventually("the viewer's presence", () => seen()?.cursor !== undefined);
    expect(seen()!.user).toEqual({ name: "Real Viewer", colour: "#236cc1", role: "viewer" });

    // A second socket claiming the owner's awareness client is not heard.
    const impostor = joinRoom(server.url, id, viewer.cookieHeader);
    open.push(impostor);
    await impostor.synced;
    const ownerClock = ownerRoom.provider.awareness.meta.get(ownerRoom.doc.clientID)!.clock;
    const forged = new Map([[ownerRoom.doc.clientID, { cursor: "forged" }]]);
    impostor.provider.awareness.meta.set(ownerRoom.doc.clientID, { clock: ownerClock + 10, lastUpdated: Date.now() });
    impostor.provider.ws!.send(new Uint8Array(encodeAwareness(impostor, ownerRoom.doc.clientID, forged)));
    // The impostor's own presence, sent after the forgery on the same socket, arrives after it.
    impostor.provider.awareness.setLocalStateField("cursor", "after the forgery");
    await eventually("the impostor's own presence", () => (viewerRoom.provider.awareness.getStates().get(impostor.doc.clientID) as { cursor?: unknown } | undefined)?.cursor === "after the forgery");
    const ownerAsSeenByViewer = viewerRoom.provider.awareness.getStates().get(ownerRoom.doc.clientID) as { cursor?: unknown } | undefined;
    expect(ownerAsSeenByViewer?.cursor).not.toBe("forged");
  });

  it("lets a view-link visitor watch, and closes the socket when the link is revoked", async () => {
    const owner = await signUp(server.url, "Lecturer");
    const id = await createMechanism(owner, "A <=> B @ 1, 2\n");
    const created = await owner.json(`/api/v1/mechanisms/${id}/view-links`, "POST", {});
    expect(created.status).toBe(201);
    const link = (await created.json()) as { id: string; url: string };
    const visitor = new Client(server.url);
    expect((await visitor.get(new URL(link.url).pathname)).status).toBe(302);

    const ownerRoom = join(owner, id);
    const visitorRoom = join(visitor, id);
    await Promise.all([ownerRoom.synced, visitorRoom.synced]);
    ownerRoom.text.insert(ownerRoom.text.length, "B -> C @ 3\n");
    await eventually("the visitor to see the edit", () => visitorRoom.text.toString().includes("B -> C"));
    visitorRoom.text.insert(0, "# guest scribble\n");
    await eventually("the guest's update dropped", () => server.logs().includes("#1 from Guest with a view link"));
    expect(ownerRoom.text.toString()).not.toContain("guest");

    const closed = new Promise<number>((resolve) => visitorRoom.provider.on("closed", (event: { code: number }) => resolve(event.code)));
    expect((await owner.request(`/api/v1/mechanisms/${id}/view-links/${link.id}`, { method: "DELETE" })).status).toBeLessThan(300);
    expect(await closed).toBe(4403);
    expect(await rawSocket(server.url, id, visitor.cookieHeader)).toEqual({ refused: 404 });
  });

  it("refuses an edit over 1 MiB with a message, keeps the connection, and keeps what is typed after a resync", async () => {
    const owner = await signUp(server.url, "Paster");
    const id = await createMechanism(owner, "A -> B\n");
    const editor = await addMember(owner, id, "editor", "Big Paster");
    const ownerRoom = join(owner, id);
    const pasterRoom = join(editor, id);
    await Promise.all([ownerRoom.synced, pasterRoom.synced]);
    pasterRoom.text.insert(0, `# ${"x".repeat(1024 * 1024)}\n`);
    await eventually("the refusal", () => pasterRoom.refusals.length > 0);
    expect(pasterRoom.refusals).toEqual(["text-too-large"]);
    // An edit built on the refused one is refused too, never kept waiting for it.
    pasterRoom.text.insert(3, "typed after");
    await eventually("the second refusal", () => pasterRoom.refusals.length > 1);
    expect(pasterRoom.refusals[1]).toBe("out-of-step");
    expect(pasterRoom.provider.wsconnected).toBe(true);

    // The browser then drops its copy and joins again; what it types from there on is kept.
    pasterRoom.close();
    const again = join(editor, id);
    await again.synced;
    expect(again.text.toString()).toBe("A -> B\n");
    again.text.insert(again.text.length, "C -> D\n");
    ownerRoom.text.insert(0, "# owner\n");
    await eventually("both edits stored", async () => (await storedDocument(server.databaseUrl, id)).getText("source").toString() === "# owner\nA -> B\nC -> D\n");
    expect(again.refusals).toEqual([]);
  });

  it("refuses other top-level types, analysis keys, misshapen positions and NUL, saying why and keeping the connection", async () => {
    const owner = await signUp(server.url, "Shape Keeper");
    const id = await createMechanism(owner, "A -> B\n");
    const ownerRoom = join(owner, id);
    await ownerRoom.synced;
    await eventually("the first analysis", () => ownerRoom.analysis.has("deficiency"));
    const attempts: [(doc: Y.Doc) => void, string][] = [
      [(doc) => doc.getText("junk").insert(0, "x".repeat(1_000_000)), "shape"],
      [(doc) => doc.getArray("list").push(["x".repeat(1000)]), "shape"],
      [(doc) => doc.getMap("analysis").set("deficiency", 99), "shape"],
      [(doc) => doc.getMap("analysis").set("forged", "x".repeat(1000)), "shape"],
      [(doc) => doc.getMap("layout").set("A", { x: 1, y: "x".repeat(100_000) }), "shape"],
      [(doc) => doc.getMap("layout").set("B", new Y.Map()), "shape"],
      [(doc) => doc.getText("source").insert(0, "A\0B -> C\n"), "nul-character"],
    ];
    for (const [edit, reason] of attempts) {
      const room = join(owner, id);
      await room.synced;
      edit(room.doc);
      await eventually(`the refusal (${reason})`, () => room.refusals.length > 0);
      expect(room.refusals).toEqual([reason]);
      expect(room.provider.wsconnected).toBe(true);
      room.close();
    }
    ownerRoom.doc.getMap("layout").set("A", { x: 10, y: 20 });
    ownerRoom.text.insert(ownerRoom.text.length, "B -> C\n");
    await eventually("the honest edits stored", async () => (await storedDocument(server.databaseUrl, id)).getText("source").toString() === "A -> B\nB -> C\n");
    const stored = await storedDocument(server.databaseUrl, id);
    expect([...stored.share.keys()].sort()).toEqual(["analysis", "layout", "source"]);
    expect(stored.getMap("layout").toJSON()).toEqual({ A: { x: 10, y: 20 } });
    expect(stored.getMap("analysis").get("deficiency")).not.toBe(99);
    expect(stored.getMap("analysis").has("forged")).toBe(false);
    expect(ownerRoom.refusals).toEqual([]);
  });

  it("takes NUL out of a text stored before the room refused it, so the mirror and named versions save", async () => {
    const owner = await signUp(server.url, "Old Data Owner");
    const id = await createMechanism(owner, "");
    const old = new Y.Doc();
    old.getText("source").insert(0, "A\0 -> B\0\n");
    const db = new pg.Client(server.databaseUrl);
    await db.connect();
    await db.query("insert into doc_updates (mechanism_id, update) values ($1, $2)", [id, Buffer.from(Y.encodeStateAsUpdate(old))]);

    const room = join(owner, id);
    await room.synced;
    await eventually("the text without NUL", () => room.text.toString() === "A -> B\n");
    const named = await owner.json(`/api/v1/mechanisms/${id}/snapshots`, "POST", { name: "clean" });
    expect(named.status).toBe(201);
    const stored = await db.query("select source from snapshots where mechanism_id = $1 and name = 'clean'", [id]);
    await db.end();
    expect(stored.rows[0].source).toBe("A -> B\n");
    await eventually("the mirror saved", async () => ((await (await owner.get(`/api/v1/mechanisms/${id}`)).json()) as { source: string }).source === "A -> B\n");
  });

  it("caps a view-link guest's presence ids, state size and rate", async () => {
    const owner = await signUp(server.url, "Presence Host");
    const id = await createMechanism(owner, "A -> B\n");
    const link = (await (await owner.json(`/api/v1/mechanisms/${id}/view-links`, "POST", {})).json()) as { url: string };
    const guest = new Client(server.url);
    await guest.get(new URL(link.url).pathname);
    const ownerRoom = join(owner, id);
    const guestRoom = join(guest, id);
    await Promise.all([ownerRoom.synced, guestRoom.synced]);
    const own = guestRoom.doc.clientID;
    const claim = (ids: number[], state: Record<string, unknown>) => {
      const awareness = new awarenessProtocol.Awareness(new Y.Doc());
      for (const clientId of ids) {
        awareness.states.set(clientId, state);
        awareness.meta.set(clientId, { clock: 50, lastUpdated: Date.now() });
      }
      const message = encoding.createEncoder();
      encoding.writeVarUint(message, 1);
      encoding.writeVarUint8Array(message, awarenessProtocol.encodeAwarenessUpdate(awareness, ids));
      guestRoom.provider.ws!.send(encoding.toUint8Array(message));
    };
    const ids = Array.from({ length: 200 }, (_, i) => 1_000_000 + i);
    claim(ids, { note: "x".repeat(15 * 1024) });
    claim(ids, { note: "small" });
    claim([own], { cursor: "marker" });
    const seen = () => ownerRoom.provider.awareness.getStates();
    await eventually("the guest's marker", () => (seen().get(own) as { cursor?: unknown } | undefined)?.cursor === "marker");
    const claimed = ids.filter((clientId) => seen().has(clientId));
    // The guest's own client and three more: four per connection.
    expect(claimed.length).toBe(3);
    expect(claimed.every((clientId) => (seen().get(clientId) as { note: string }).note === "small")).toBe(true);

    for (let i = 0; i < 40; i++) claim([own], { cursor: i, note: "y".repeat(2000) });
    await eventually("presence over the rate dropped", () => server.logs().includes("over its rate"));
  });

  it("closes a socket within seconds of its token being revoked, its session signed out or deleted", async () => {
    const owner = await signUp(server.url, "Leaving Owner");
    const id = await createMechanism(owner, "A -> B\n");
    const created = await owner.json("/api/v1/tokens", "POST", { name: "live script" });
    expect(created.status).toBe(201);
    const token = (await created.json()) as { id: string; token: string };
    const laptop = new Client(server.url);
    expect((await laptop.post("/sign-in", { email: owner.email, password: "correct horse battery" })).status).toBe(302);

    const browserRoom = join(owner, id);
    const laptopRoom = join(laptop, id);
    const scriptRoom = joinRoom(server.url, id, "", { authorization: `Bearer ${token.token}` });
    open.push(scriptRoom);
    await Promise.all([browserRoom.synced, laptopRoom.synced, scriptRoom.synced]);
    const closedWithin = async (room: RoomClient, act: () => Promise<unknown>) => {
      const closed = new Promise<number>((resolve) => room.provider.on("closed", (event: { code: number }) => resolve(event.code)));
      const started = Date.now();
      await act();
      expect(await closed).toBe(4401);
      return Date.now() - started;
    };

    const timings = [
      await closedWithin(scriptRoom, () => owner.request(`/api/v1/tokens/${token.id}`, { method: "DELETE" })),
      await closedWithin(browserRoom, () => owner.post("/sign-out", {})),
      // As a password reset does, whatever code deletes the rows.
      await closedWithin(laptopRoom, async () => {
        const client = new pg.Client(server.databaseUrl);
        await client.connect();
        await client.query("delete from sessions where user_id = (select id from users where email = $1)", [owner.email]);
        await client.end();
      }),
    ];
    // A second or two, with room for a loaded machine.
    for (const ms of timings) expect(ms).toBeLessThan(5000);
    expect(await rawSocket(server.url, id, laptop.cookieHeader)).toEqual({ refused: 401 });
  });

  it("recomputes the structure into the analysis map with a growing revision", async () => {
    const owner = await signUp(server.url, "Analyst");
    const id = await createMechanism(owner, "X + Y -> 2Y @ 1\n");
    const viewer = await addMember(owner, id, "viewer", "Watcher");
    const ownerRoom = join(owner, id);
    const viewerRoom = join(viewer, id);
    await Promise.all([ownerRoom.synced, viewerRoom.synced]);
    await eventually("a first analysis", () => viewerRoom.analysis.get("species") === 2);
    const first = viewerRoom.analysis.get("revision") as number;
    expect(viewerRoom.analysis.get("deficiency")).toBe(0);
    expect(viewerRoom.analysis.get("linkageClasses")).toBe(1);

    ownerRoom.text.insert(ownerRoom.text.length, "Y -> 0 @ 10\nX <=> 2X @ 30, 0.25\n");
    await eventually("the analysis of the new text", () => viewerRoom.analysis.get("linkageClasses") === 3);
    expect(viewerRoom.analysis.get("revision") as number).toBeGreaterThan(first);
    expect(viewerRoom.analysis.get("errors")).toBe(0);
    expect(viewerRoom.analysis.get("rank")).toBe(2);
    // The full report travels packed (app/shared/analysis-map.ts).
    const { report } = roomAnalysisReader()(viewerRoom.analysis);
    expect(report?.complexes).toContain("X + Y");
    // The equations travel apart, for the panel that shows them.
    expect(report).not.toHaveProperty("odes");
    const equations = unpack<RoomEquations>(viewerRoom.analysis.get("equations") as Uint8Array);
    expect(Object.keys(equations.odesLatex).sort()).toEqual(["X", "Y"]);

    // Only the server writes the analysis: an editor's write to it is refused, a deletion put back.
    const deficiency = viewerRoom.analysis.get("deficiency");
    expect(deficiency).toBe(1);
    ownerRoom.analysis.set("deficiency", 42);
    await eventually("the refusal", () => ownerRoom.refusals.length > 0);
    expect(ownerRoom.refusals).toEqual(["shape"]);
    ownerRoom.close();
    const eraser = join(owner, id);
    await eraser.synced;
    expect(eraser.analysis.get("deficiency")).toBe(deficiency);
    eraser.analysis.delete("deficiency");
    await eventually("the server's value back", () => eraser.analysis.get("deficiency") === deficiency && viewerRoom.analysis.get("deficiency") === deficiency);

    const revision = viewerRoom.analysis.get("revision") as number;
    eraser.text.insert(0, "X -> @ \n");
    await eventually("errors reported", () => (viewerRoom.analysis.get("errors") as number) > 0);
    expect(viewerRoom.analysis.get("revision") as number).toBeGreaterThan(revision);
  });

  it("writes PUT source through the live document, with the API's statuses", async () => {
    const owner = await signUp(server.url, "Scripter");
    const id = await createMechanism(owner, "A -> B\n");
    const viewer = await addMember(owner, id, "viewer", "Script Viewer");
    const stranger = await signUp(server.url, "Outsider");
    const room = join(viewer, id);
    await room.synced;

    const put = (client: Client, body: unknown) => client.json(`/api/v1/mechanisms/${id}/source`, "PUT", body);
    const response = await put(owner, { source: "A -> B\nB -> C @ 3\n" });
    expect(response.status).toBe(200);
    await eventually("the room to see the new text", () => room.text.toString() === "A -> B\nB -> C @ 3\n");
    const fetched = (await (await owner.get(`/api/v1/mechanisms/${id}`)).json()) as { source: string };
    expect(fetched.source).toBe("A -> B\nB -> C @ 3\n");

    expect((await put(viewer, { source: "" })).status).toBe(403);
    expect((await put(stranger, { source: "" })).status).toBe(404);
    expect((await put(owner, { text: "no" })).status).toBe(400);
    const tooLarge = await put(owner, { source: "#".repeat(1024 * 1024 + 1) });
    expect(tooLarge.status).toBe(413);
    expect(await tooLarge.json()).toHaveProperty("error");
    expect(room.text.toString()).toBe("A -> B\nB -> C @ 3\n");
  });

  it("drops the layout positions of complexes long gone from the text, keeping those in it", async () => {
    const owner = await signUp(server.url, "Tidy Layout");
    const id = await createMechanism(owner, "A + B -> C @ 1\n");
    const room = join(owner, id);
    await room.synced;
    const layout = room.doc.getMap("layout");
    room.doc.transact(() => {
      layout.set("A + B", { x: 10, y: 20 });
      for (let i = 0; i < 250; i++) layout.set(`Gone${i}`, { x: i, y: 0 });
    });
    room.text.insert(room.text.length, "C -> D @ 2\n");
    await eventually("the gone complexes' positions to be dropped", () => ![...layout.keys()].some((key) => key.startsWith("Gone")));
    expect(layout.get("A + B")).toEqual({ x: 10, y: 20 });
  });

  it("keeps the stored text within a second or so of co-authors who type without a pause", async () => {
    const owner = await signUp(server.url, "Steady Typist");
    const id = await createMechanism(owner, "A -> B\n");
    const room = join(owner, id);
    await room.synced;
    const stored = async () => {
      const db = new pg.Client(server.databaseUrl);
      await db.connect();
      try {
        return (await db.query("select source from mechanisms where id = $1", [id])).rows[0].source as string;
      } finally {
        await db.end();
      }
    };
    let typedBySecond = "";
    for (let i = 0; i < 30; i++) {
      room.text.insert(room.text.length, "#");
      if (i === 9) typedBySecond = room.text.toString();
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    // Two seconds after the first second's typing, with keystrokes every 100 ms all along.
    expect((await stored()).length).toBeGreaterThanOrEqual(typedBySecond.length);
  });

  it("keeps versions on structural change, names them, and restores one as a new change", async () => {
    const owner = await signUp(server.url, "Historian");
    const id = await createMechanism(owner, "A -> B @ 1\n");
    const viewer = await addMember(owner, id, "viewer", "History Viewer");
    const room = join(owner, id);
    await room.synced;
    type Listing = { snapshots: { id: number; kind: string; name: string | null; author: string | null; summary: { species: number; deficiency: number } }[] };
    const list = async () => ((await (await viewer.get(`/api/v1/mechanisms/${id}/snapshots`)).json()) as Listing).snapshots;
    await eventually("a first automatic version", async () => (await list()).length === 1, 8000);

    room.text.insert(room.text.length, "B -> C @ 2\n");
    await eventually("a second automatic version", async () => (await list()).length === 2, 8000);
    const [second, first] = await list();
    expect(second).toMatchObject({ kind: "auto", author: "Historian", summary: { species: 3 } });
    expect(first.summary.species).toBe(2);

    const named = await owner.json(`/api/v1/mechanisms/${id}/snapshots`, "POST", { name: "two steps" });
    expect(named.status).toBe(201);
    expect((await viewer.json(`/api/v1/mechanisms/${id}/snapshots`, "POST", { name: "mine" })).status).toBe(403);
    expect((await owner.json(`/api/v1/mechanisms/${id}/snapshots`, "POST", { name: "" })).status).toBe(400);

    const restored = await owner.post(`/m/${id}/history`, { intent: "restore", snapshotId: String(first.id) });
    expect(restored.status).toBe(200);
    await eventually("the old text back in the room", () => room.text.toString() === "A -> B @ 1\n");
    const versions = await list();
    expect(versions[0]).toMatchObject({ kind: "restore", summary: { species: 2 } });
    expect(versions.some((v) => v.kind === "named" && v.name === "two steps")).toBe(true);
    expect((await viewer.post(`/m/${id}/history`, { intent: "restore", snapshotId: String(first.id) })).status).toBe(403);

    const page = await (await viewer.get(`/m/${id}/history?from=${second.id}&to=${versions[0].id}`)).text();
    expect(page).toContain("species 3 → 2");
    expect(page).toContain("B -&gt; C @ 2");
  });
});
