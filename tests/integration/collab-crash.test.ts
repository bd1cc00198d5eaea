// Durability. kill -9 in the middle of a session: every update the server acknowledged (relayed
// to another member, which it does only after the insert commits) is in the database afterwards,
// and what a client still holds re-syncs when the server is back. A clean shutdown flushes and
// compacts the log.
import pg from "pg";
import * as Y from "yjs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eventually, joinRoom, storedDocument, typeAtRandom } from "../support/collab-client";
import { signUp } from "../support/http";
import { startTestServer } from "../support/server";

/**
 * What one kill -9 and restart may take: the server's boot (migrations checked, the queue and the
 * room bus connected) is a second or two alone and tens of seconds on a machine shared by many
 * test runs, plus the joins and typing around it. The tests' budgets count restarts, not a fixed
 * total, so they hold however slow the machine is.
 */
const RESTART_MS = 60_000;
/** Rounds of typing, kill -9 and restart in the first test, before the one with a client that stays up. */
const ROUNDS = 3;

let server: Awaited<ReturnType<typeof startTestServer>>;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server?.dispose());

describe("durability", () => {
  it("keeps every acknowledged update through kill -9, and takes back what clients still hold", async () => {
    const owner = await signUp(server.url, "Crash Owner");
    const viewer = await signUp(server.url, "Crash Witness");
    const { id } = (await (await owner.json("/api/v1/mechanisms", "POST", { title: "Crash", source: "A -> B\n" })).json()) as { id: string };
    await owner.post(`/m/${id}/members`, { intent: "add", email: viewer.email, role: "viewer" });

    for (let round = 0; round < ROUNDS; round++) {
      const editor = joinRoom(server.url, id, owner.cookieHeader);
      const witness = joinRoom(server.url, id, viewer.cookieHeader);
      await Promise.all([editor.synced, witness.synced]);
      let typing = true;
      const typist = typeAtRandom(editor.text, () => typing);
      // The crash comes after a random amount of acknowledged typing, however busy the machine.
      const grown = witness.text.length + 10 + Math.floor(Math.random() * 40);
      await eventually("typing acknowledged to the witness", () => witness.text.length >= grown, RESTART_MS);
      await server.crash();
      typing = false;
      expect(await typist).toBeGreaterThan(10);

      // What the witness received was acknowledged; nobody can resend it once both clients are gone.
      const acknowledged = Y.encodeStateAsUpdate(witness.doc);
      witness.close();
      editor.close();
      await server.restart();

      const stored = await storedDocument(server.databaseUrl, id);
      const storedText = stored.getText("source").toString();
      Y.applyUpdate(stored, acknowledged);
      expect(stored.getText("source").toString()).toBe(storedText);

      const fresh = joinRoom(server.url, id, owner.cookieHeader);
      await fresh.synced;
      expect(fresh.text.toString()).toBe(storedText);
      fresh.close();
    }

    // A client that stays up through the crash re-sends what the server had not stored.
    const editor = joinRoom(server.url, id, owner.cookieHeader);
    await editor.synced;
    let typing = true;
    const typist = typeAtRandom(editor.text, () => typing);
    const grown = editor.text.length + 20;
    await eventually("some typing", () => editor.text.length >= grown, RESTART_MS);
    await server.crash();
    typing = false;
    await typist;
    editor.text.insert(0, "# typed while the server was down\n");
    await server.restart();
    await eventually("the editor's text to be stored", async () => {
      const stored = await storedDocument(server.databaseUrl, id);
      return stored.getText("source").toString() === editor.text.toString();
    }, RESTART_MS);
    editor.close();
  }, (ROUNDS + 1) * RESTART_MS);

  it("flushes and compacts on a clean shutdown, and reloads from the compacted state", async () => {
    const owner = await signUp(server.url, "Tidy Owner");
    const { id } = (await (await owner.json("/api/v1/mechanisms", "POST", { title: "Tidy", source: "A -> B @ 1\n" })).json()) as { id: string };
    const editor = joinRoom(server.url, id, owner.cookieHeader);
    await editor.synced;
    for (const line of ["B -> C @ 2\n", "C -> A @ 3\n", "# a closed cycle\n"]) editor.text.insert(editor.text.length, line);
    await eventually("the analysis of the cycle", () => editor.analysis.get("reactions") === 3, RESTART_MS);
    const text = editor.text.toString();
    const revision = editor.analysis.get("revision") as number;
    editor.close();
    await server.stop();

    const db = new pg.Client(server.databaseUrl);
    await db.connect();
    const rows = async (sql: string) => (await db.query(sql, [id])).rows;
    expect(await rows("select id from doc_updates where mechanism_id = $1")).toHaveLength(0);
    expect(await rows("select through_update from doc_states where mechanism_id = $1")).toHaveLength(1);
    expect((await rows("select source from mechanisms where id = $1"))[0].source).toBe(text);
    await db.end();

    await server.restart();
    const again = joinRoom(server.url, id, owner.cookieHeader);
    await again.synced;
    expect(again.text.toString()).toBe(text);
    again.text.insert(0, "D -> A @ 4\n");
    await eventually("a newer analysis", () => (again.analysis.get("revision") as number) > revision && again.analysis.get("reactions") === 4, RESTART_MS);
    again.close();
  }, 2 * RESTART_MS);
});
