// The update log against the real PostgreSQL: compactions taken while edits keep arriving lose
// nothing, and leave only the rows appended after them.
import pg from "pg";
import * as Y from "yjs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createUser } from "../auth/authenticator";
import { connect, type Database } from "../db/client";
import { createMechanism } from "../db/mechanisms";
import { createTestDatabase } from "../../tests/support/database";
import { compactDocument, loadDocument } from "./persistence";
import { postgresCollabStore } from "./postgres-store";
import { UpdateLog } from "./update-log";

let database: Database;
let dropDatabase: () => Promise<void>;
let databaseUrl: string;
beforeAll(async () => {
  const created = await createTestDatabase();
  databaseUrl = created.url;
  dropDatabase = created.drop;
  database = connect(created.url);
});
afterAll(async () => {
  await database?.close();
  await dropDatabase?.();
});

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("update log", () => {
  it("compacts while edits are appended, keeping every edit and only the rows after the last compaction", async () => {
    const owner = await createUser(database.db, { name: "Log Owner", email: "log-owner@example.test", password: "weave-test-password" });
    const mechanism = await createMechanism(database.db, owner.id, { title: "Log" });
    const doc = new Y.Doc();
    const log = new UpdateLog<null>(postgresCollabStore(database.db, "persistence-test"), mechanism.id, { committed() {}, mechanismGone() {} });
    doc.on("update", (update: Uint8Array) => log.append({ update, origin: null }));
    const text = doc.getText("source");

    let typing = true;
    const typist = (async () => {
      for (let i = 0; i < 600; i++) {
        const at = Math.floor(Math.random() * (text.length + 1));
        if (Math.random() < 0.8 || text.length === 0) text.insert(at, "XY+ \n"[i % 5]);
        else text.delete(Math.min(at, text.length - 1), 1);
        if (i % 10 === 0) await sleep(1);
      }
      typing = false;
    })();
    // Every row was applied to this document before it was inserted.
    const wholeDocument = { holds: () => true, encode: () => Y.encodeStateAsUpdate(doc) };
    let compactions = 0;
    while (typing) {
      await compactDocument(database.db, mechanism.id, wholeDocument);
      compactions++;
      await sleep(2);
    }
    await typist;
    await log.flushed();
    expect(compactions).toBeGreaterThan(3);

    const stored = await loadDocument(database.db, mechanism.id);
    const reloaded = new Y.Doc();
    if (stored.state) Y.applyUpdate(reloaded, stored.state);
    for (const update of stored.updates) Y.applyUpdate(reloaded, update);
    expect(reloaded.getText("source").toString()).toBe(text.toString());

    await compactDocument(database.db, mechanism.id, wholeDocument);
    const client = new pg.Client(databaseUrl);
    await client.connect();
    const { rows } = await client.query("select count(*)::int as n from doc_updates where mechanism_id = $1", [mechanism.id]);
    await client.end();
    expect(rows[0].n).toBe(0);
  });
});
