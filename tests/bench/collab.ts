// Collaboration benchmark on loopback, against a real server process this script starts (own
// PostgreSQL cluster, own database). Targets from PRODUCT.md: keystroke to another editor
// p95 < 50 ms; edit to recomputed structure at every client p95 < 400 ms for a 200-step
// mechanism; both in a room of 20 editors and 100 viewers.
// Run after a build (npm run build): npx tsx tests/bench/collab.ts
import { rmSync } from "node:fs";
import path from "node:path";
import { applyMigrations, connect, ensureDatabase } from "../../server/db/client";
import { clusterDir, startEmbeddedPostgres } from "../../server/postgres/embedded";
import { joinRoom, type RoomClient } from "../support/collab-client";
import { TEMPLATE_DATABASE } from "../support/database";
import { signUp, type Client } from "../support/http";
import { startTestServer } from "../support/server";
import { generatedMechanism } from "./structure";

const projectRoot = path.resolve(import.meta.dirname, "../..");
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
/** One typing area at the end: keystrokes land in a comment, so they cost a recompute but keep the structure. */
const TYPING_LINE = "# notes: ";

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

function summary(label: string, samples: number[], target: number) {
  const sorted = [...samples].sort((a, b) => a - b);
  const p50 = percentile(sorted, 50);
  const p95 = percentile(sorted, 95);
  const verdict = p95 < target ? "meets" : "MISSES";
  console.log(`  ${label.padEnd(58)} n=${String(sorted.length).padStart(6)}  p50 ${p50.toFixed(1).padStart(6)} ms  p95 ${p95.toFixed(1).padStart(6)} ms  (${verdict} p95 < ${target} ms)`);
}

/** Every client records when it first sees each keystroke token `k<n>;` typed by someone else. */
function watchKeystrokes(clients: RoomClient[], sent: Map<number, number>, into: (client: number, ms: number) => void) {
  clients.forEach((client, index) => {
    client.text.observe((event) => {
      if (event.transaction.local) return;
      const now = performance.now();
      for (const part of event.delta) {
        if (typeof part.insert !== "string") continue;
        for (const match of part.insert.matchAll(/k(\d+);/g)) {
          const at = sent.get(Number(match[1]));
          if (at !== undefined) into(index, now - at);
        }
      }
    });
  });
}

let keystrokeId = 0;
function typeKeystroke(client: RoomClient, sent: Map<number, number>) {
  const id = ++keystrokeId;
  sent.set(id, performance.now());
  client.text.insert(client.text.length, `k${id};`);
}

/** Adds a step with a new species and resolves with each client's delay until its analysis counts it. */
async function structuralEdit(editor: RoomClient, clients: RoomClient[], n: number): Promise<number[]> {
  const expected = (clients[0].analysis.get("species") as number) + 1;
  const delays: (number | null)[] = clients.map(() => null);
  const start = performance.now();
  const done = new Promise<void>((resolve) => {
    const check = () => {
      clients.forEach((client, index) => {
        if (delays[index] === null && (client.analysis.get("species") as number) >= expected) delays[index] = performance.now() - start;
      });
      if (delays.every((d) => d !== null)) resolve();
    };
    for (const client of clients) client.analysis.observe(check);
    setTimeout(resolve, 5000);
  });
  editor.text.insert(0, `Z${n} -> S1 @ 1\n`);
  await done;
  const missing = delays.filter((d) => d === null).length;
  if (missing) console.log(`  (${missing} client(s) did not see structural edit ${n} within 5 s)`);
  return delays.map((d) => d ?? 5000);
}

async function people(baseUrl: string, owner: Client, id: string, count: number, role: "editor" | "viewer"): Promise<Client[]> {
  const made: Client[] = [];
  for (let i = 0; i < count; i += 4) {
    const batch = await Promise.all(Array.from({ length: Math.min(4, count - i) }, (_, j) => signUp(baseUrl, `Bench ${role} ${i + j}`)));
    for (const person of batch) {
      const response = await owner.post(`/m/${id}/members`, { intent: "add", email: person.email, role });
      if (response.status !== 200) throw new Error(`sharing failed: ${response.status}`);
    }
    made.push(...batch);
  }
  return made;
}

async function room(baseUrl: string, clients: Client[], id: string): Promise<RoomClient[]> {
  const rooms = clients.map((c) => joinRoom(baseUrl, id, c.cookieHeader));
  await Promise.all(rooms.map((r) => r.synced));
  const speciesOf = (r: RoomClient) => r.analysis.get("species");
  const deadline = Date.now() + 10_000;
  while (rooms.some((r) => speciesOf(r) === undefined) && Date.now() < deadline) await sleep(20);
  return rooms;
}

async function main() {
  const baseDir = clusterDir(projectRoot, `postgres-bench-${process.pid}`);
  const postgres = await startEmbeddedPostgres(baseDir, 55480);
  try {
    const template = connect(await ensureDatabase(postgres.adminUrl, TEMPLATE_DATABASE));
    await applyMigrations(template.db, projectRoot);
    await template.close();
    process.env.MW_TEST_ADMIN_URL = postgres.adminUrl;
    const server = await startTestServer();
    try {
      await run(server.url);
    } finally {
      await server.dispose();
    }
  } finally {
    postgres.stop();
    rmSync(baseDir, { recursive: true, force: true });
  }
}

async function run(baseUrl: string) {
  const source = generatedMechanism(270, 120, { seed: 7 });
  const steps = source.trim().split("\n").length;
  const owner = await signUp(baseUrl, "Bench Owner");
  const created = await owner.json("/api/v1/mechanisms", "POST", { title: "Bench", source: `${source}${TYPING_LINE}` });
  const { id } = (await created.json()) as { id: string };
  console.log(`Collaboration on loopback: a ${steps}-step mechanism (${source.length} characters).`);

  // Two editors.
  const [partner] = await people(baseUrl, owner, id, 1, "editor");
  const pair = await room(baseUrl, [owner, partner], id);
  const sent = new Map<number, number>();
  const pairKeystrokes: number[] = [];
  watchKeystrokes(pair, sent, (_client, ms) => pairKeystrokes.push(ms));
  for (let i = 0; i < 400; i++) {
    typeKeystroke(pair[0], sent);
    await sleep(15);
  }
  await sleep(500);
  const pairStructure: number[] = [];
  for (let n = 0; n < 20; n++) {
    pairStructure.push(...(await structuralEdit(pair[0], pair, n)));
    await sleep(100);
  }
  console.log("Two editors:");
  summary("keystroke → the other editor", pairKeystrokes, 50);
  summary("edit → recomputed structure at both clients", pairStructure, 400);
  for (const client of pair) client.close();

  // 20 editors and 100 viewers, everyone typing while structural edits go in.
  const editors = [owner, partner, ...(await people(baseUrl, owner, id, 18, "editor"))];
  const viewers = await people(baseUrl, owner, id, 100, "viewer");
  const everyone = await room(baseUrl, [...editors, ...viewers], id);
  const typing = everyone.slice(0, editors.length);
  const toEditors: number[] = [];
  const toEveryone: number[] = [];
  watchKeystrokes(everyone, sent, (client, ms) => {
    toEveryone.push(ms);
    if (client < editors.length) toEditors.push(ms);
  });
  let running = true;
  // Each editor types about five keystrokes a second: a hundred a second in the room.
  const typists = typing.map(async (client) => {
    await sleep(Math.random() * 200);
    for (let i = 0; running && i < 200; i++) {
      typeKeystroke(client, sent);
      await sleep(150 + Math.random() * 100);
    }
  });
  const crowdStructure: number[] = [];
  await sleep(1000);
  for (let n = 100; n < 115; n++) {
    crowdStructure.push(...(await structuralEdit(typing[n % typing.length], everyone, n)));
    await sleep(400);
  }
  running = false;
  await Promise.all(typists);
  await sleep(500);
  console.log(`A room of ${editors.length} editors and ${viewers.length} viewers, ~${editors.length * 5} keystrokes/s:`);
  summary("keystroke → every other editor", toEditors, 50);
  summary("keystroke → every other client (editors and viewers)", toEveryone, 50);
  summary(`edit → recomputed structure at all ${everyone.length} clients`, crowdStructure, 400);
  for (const client of everyone) client.close();
}

await main();
