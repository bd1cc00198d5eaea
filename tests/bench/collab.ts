// Collaboration benchmark on loopback, against a real server process this script starts (own
// PostgreSQL cluster, own database). Targets from PRODUCT.md: keystroke to another editor
// p95 < 50 ms; edit to recomputed structure at every client p95 < 400 ms for a 200-step
// mechanism; both in a room of 20 editors and 100 viewers.
// The members live in a few child processes (collab-members.ts), editors apart from viewers, as
// separate browsers would be, so one busy member does not hold up the others. Times are compared
// across processes on the system clock (see collab-members.ts).
// Run after a build (npm run build): npx tsx tests/bench/collab.ts
import { fork, type ChildProcess } from "node:child_process";
import { readdirSync, readFileSync } from "node:fs";
import os from "node:os";
import { fileURLToPath } from "node:url";
import { signUp, type Client } from "../support/http";
import { startTestServer } from "../support/server";
import { summary, withBenchCluster } from "./bench-support";
import type { Command, Report } from "./collab-members";
import { generatedMechanism } from "./structure";

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
/** Keystrokes land in a trailing comment: each costs a recompute but keeps the structure. */
const TYPING_LINE = "# notes: ";
const STRUCTURE_TIMEOUT_MS = 5000;
/** Scheduling priority of the client processes (nice), below the server's. */
const CLIENT_NICENESS = 10;

class ClientHost {
  private readonly child: ChildProcess;
  private readonly inbox: Report[] = [];
  private waiter: (() => void) | null = null;

  constructor() {
    this.child = fork(fileURLToPath(new URL("./collab-members.ts", import.meta.url)), [], { execArgv: ["--import", "tsx"], stdio: "inherit" });
    // The members' own work would run on their own machines: here it yields to the server.
    os.setPriority(this.child.pid!, CLIENT_NICENESS);
    this.child.on("message", (message: Report) => {
      this.inbox.push(message);
      this.waiter?.();
    });
  }

  send(command: Command) {
    this.child.send(command);
  }

  async next<T extends Report["type"]>(type: T): Promise<Extract<Report, { type: T }>> {
    for (;;) {
      const index = this.inbox.findIndex((m) => m.type === type);
      if (index >= 0) return this.inbox.splice(index, 1)[0] as Extract<Report, { type: T }>;
      await new Promise<void>((resolve) => (this.waiter = resolve));
    }
  }
}

/** CPU time (ms) of the server process this script started, read from /proc. */
function serverCpuMs(): number {
  for (const pid of readdirSync("/proc").filter((name) => /^\d+$/.test(name))) {
    try {
      const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      if (Number(fields[1]) !== process.pid || !readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("build/mechweave-server.js")) continue;
      return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100;
    } catch {
      continue;
    }
  }
  return Number.NaN;
}

interface Scenario {
  title: string;
  editors: Client[];
  viewers: Client[];
  /** Client processes hosting the editors, and those hosting the viewers. */
  editorProcesses: number;
  viewerProcesses: number;
  typists: number;
  keystrokes: number;
  periodMs: number;
  structuralEdits: number;
}

/** What the benchmark's room has been through: runs (a token prefix each), structural edits, species. */
interface RoomProgress {
  runs: number;
  edits: number;
  species: number;
}

/** Typing at the scenario's pace with structural edits between; the measured samples. */
async function phase(hosts: ClientHost[], scenario: Scenario, keystrokes: number, structuralEdits: number, room: RoomProgress) {
  const editorHosts = hosts.slice(0, scenario.editorProcesses);
  const perHost = Math.ceil(scenario.typists / editorHosts.length);
  editorHosts.forEach((host) => host.send({ type: "type", typists: perHost, count: keystrokes, periodMs: scenario.periodMs }));
  await sleep(500);
  const structure: number[] = [];
  for (let i = 0; i < structuralEdits; i++) {
    const n = room.edits++;
    const expected = ++room.species;
    for (const host of hosts) host.send({ type: "watch", n, expected, timeoutMs: STRUCTURE_TIMEOUT_MS });
    const editing = editorHosts[i % editorHosts.length];
    editing.send({ type: "edit", n });
    const { at: editedAt } = await editing.next("edited");
    const delays = (await Promise.all(hosts.map((h) => h.next("seen")))).flatMap((seen) => seen.at.map((at) => (at === null ? STRUCTURE_TIMEOUT_MS : at - editedAt)));
    progress(`structural edit ${n}: slowest client ${Math.max(...delays).toFixed(0)} ms`);
    structure.push(...delays);
    await sleep(300);
  }
  const sent = new Map((await Promise.all(editorHosts.map((h) => h.next("typed")))).flatMap((t) => t.sent));
  return { sent, structure };
}

async function measure(baseUrl: string, id: string, scenario: Scenario, room: RoomProgress) {
  const editors = scenario.editors.map((c) => ({ cookie: c.cookieHeader, editor: true }));
  const viewers = scenario.viewers.map((c) => ({ cookie: c.cookieHeader, editor: false }));
  const people = [...editors, ...viewers];
  // Editors and viewers in processes of their own (as each would be on a machine of their own):
  // a keystroke reaching an editor does not queue behind fifty viewers applying it first.
  const spread = <T,>(members: T[], processes: number) => Array.from({ length: processes }, (_, p) => members.filter((_, i) => i % processes === p));
  const groups = [...spread(editors, scenario.editorProcesses), ...spread(viewers, scenario.viewerProcesses)];
  const hosts = groups.map(() => new ClientHost());
  const run = room.runs++;
  hosts.forEach((host, tag) => host.send({ type: "join", baseUrl, id, run, tag, people: groups[tag] }));
  const joined = await Promise.all(hosts.map((h) => h.next("joined")));
  progress(`${scenario.title}: ${people.length} clients joined`);
  room.species = Math.max(...joined.map((j) => j.species));

  // Warm-up (common practice, no source): the first second of a room's typing and its first
  // structural edit also pay for compiling code paths, in the server and in every client.
  await phase(hosts, scenario, Math.ceil(1000 / scenario.periodMs), 1, room);
  for (const host of hosts) host.send({ type: "reset" });
  await Promise.all(hosts.map((h) => h.next("reset")));

  const started = { wall: performance.now(), server: serverCpuMs() };
  const { sent, structure } = await phase(hosts, scenario, scenario.keystrokes, scenario.structuralEdits, room);
  for (const host of hosts) host.send({ type: "collect" });
  const collected = await Promise.all(hosts.map((h) => h.next("received")));
  const wallMs = performance.now() - started.wall;
  const serverMs = serverCpuMs() - started.server;
  const clientsMs = collected.reduce((sum, r) => sum + r.cpuMs, 0);
  const toEditors: number[] = [];
  const toEveryone: number[] = [];
  for (const [token, at, editor] of collected.flatMap((r) => r.keystrokes)) {
    const sentAt = sent.get(token);
    if (sentAt === undefined) continue; // a late warm-up keystroke
    toEveryone.push(at - sentAt);
    if (editor) toEditors.push(at - sentAt);
  }

  console.log(`${scenario.title}:`);
  const impossible = toEveryone.filter((ms) => ms < -1).length;
  if (impossible > 0) console.log(`  WARNING: ${impossible} deliveries stamped before they were sent; the processes' clocks disagree.`);
  summary("keystroke → every other editor", toEditors, 50);
  if (scenario.viewers.length > 0) summary("keystroke → every other client (editors and viewers)", toEveryone, 50);
  summary(`edit → recomputed structure at all ${people.length} clients`, structure, 400);
  const share = (ms: number) => `${((100 * ms) / wallMs).toFixed(0)}% of a core`;
  console.log(`  CPU over ${(wallMs / 1000).toFixed(1)} s: server main thread and analysis worker ${share(serverMs)}, the client processes ${share(clientsMs)}.`);
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

async function run(baseUrl: string) {
  const source = generatedMechanism(270, 120, { seed: 7 });
  const owner = await signUp(baseUrl, "Bench Owner");
  const created = await owner.json("/api/v1/mechanisms", "POST", { title: "Bench", source: `${source}${TYPING_LINE}` });
  const { id } = (await created.json()) as { id: string };
  console.log(`Collaboration on loopback: a ${source.trim().split("\n").length}-step mechanism; ${os.cpus().length} cores, load average ${os.loadavg()[0].toFixed(1)} at the start.`);
  const roomProgress: RoomProgress = { runs: 0, edits: 0, species: 0 };
  const editors = [owner, ...(await people(baseUrl, owner, id, 19, "editor"))];
  const viewers = await people(baseUrl, owner, id, 100, "viewer");
  progress("accounts ready");
  await measure(baseUrl, id, { title: "Two editors, one typing ~65 keystrokes/s", editors: editors.slice(0, 2), viewers: [], editorProcesses: 1, viewerProcesses: 0, typists: 1, keystrokes: 400, periodMs: 15, structuralEdits: 20 }, roomProgress);
  // The room at a steady pace (each editor 2 keystrokes a second), then as a typing storm (5 a second).
  for (const [perSecond, keystrokes] of [[2, 30], [5, 60]]) {
    const title = `20 editors (all typing, ~${20 * perSecond} keystrokes/s in all) and 100 viewers`;
    await measure(baseUrl, id, { title, editors, viewers, editorProcesses: 1, viewerProcesses: 2, typists: 20, keystrokes, periodMs: 1000 / perSecond, structuralEdits: 15 }, roomProgress);
  }
  console.log(`Load average at the end: ${os.loadavg()[0].toFixed(1)}.`);
}

/** Progress on stderr, so a long run shows where it is. */
const progress = (message: string) => process.stderr.write(`[bench ${new Date().toISOString().slice(11, 19)}] ${message}\n`);

async function main() {
  await withBenchCluster("bench", 55480, async () => {
    // Served as in production (warm workers, no development checks).
    const server = await startTestServer({ NODE_ENV: "production" });
    try {
      await run(server.url);
    } finally {
      await server.dispose();
    }
  });
}

await main();
