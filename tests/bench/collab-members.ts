// The members of the collaboration benchmark's room, hosted in a child process of the driver
// (collab.ts): real y-websocket providers for editors, bare protocol followers for viewers. Kept
// apart from the driver so that a member process loads only the collaboration client, not the
// server, the database and the chemistry the driver needs.
import { followRoom, joinRoom, type RoomReplica } from "../support/collab-client";

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
/**
 * Milliseconds on the system clock, to compare stamps across processes. A process's
 * performance.timeOrigin is fixed when it starts, and member processes were seen to disagree by
 * tens of milliseconds that way; so the offset to the live clock is measured when a phase starts.
 * Date.now() truncates to the millisecond: averaged over many reads that is half a millisecond
 * in every process alike.
 */
let clockOffset = 0;
function calibrateClock() {
  let sum = 0;
  for (let i = 0; i < 1000; i++) sum += Date.now() - performance.now();
  clockOffset = sum / 1000 + 0.5;
}
const now = () => performance.now() + clockOffset;
/** A keystroke's token: run, author and count, unique over the whole benchmark. */
const TOKEN = /k(\d+s\d+x\d+);/g;

export type Command =
  | { type: "join"; baseUrl: string; id: string; run: number; tag: number; people: { cookie: string; editor: boolean }[] }
  | { type: "type"; typists: number; count: number; periodMs: number }
  | { type: "watch"; n: number; expected: number; timeoutMs: number }
  | { type: "edit"; n: number }
  | { type: "reset" }
  | { type: "collect" };

export type Report =
  | { type: "joined"; species: number }
  | { type: "typed"; sent: [string, number][] }
  | { type: "seen"; n: number; at: (number | null)[] }
  | { type: "edited"; n: number; at: number }
  | { type: "reset" }
  | { type: "received"; keystrokes: [string, number, boolean][]; cpuMs: number };

async function clientProcess() {
  // Every provider adds an exit listener to the process; thirty of them are expected here.
  process.setMaxListeners(0);
  let rooms: { client: RoomReplica; editor: boolean; author: string; typed: number }[] = [];
  const received: [string, number, boolean][] = [];
  let watching: { expected: number; at: (number | null)[]; allSeen: () => void } | null = null;
  let cpuAtStart = process.cpuUsage();
  const report = (message: Report) => process.send!(message);

  const structureSeen = (index: number) => {
    if (!watching || watching.at[index] !== null) return;
    if ((rooms[index].client.analysis.get("species") as number) < watching.expected) return;
    watching.at[index] = now();
    if (watching.at.every((t) => t !== null)) watching.allSeen();
  };

  process.on("message", async (command: Command) => {
    if (command.type === "join") {
      calibrateClock();
      // Tokens of earlier runs come with the first sync: only this run's count.
      const run = `${command.run}s`;
      // A native search first: most messages (presence, the structure report) hold no keystroke.
      const marker = `k${run}`;
      rooms = command.people.map((person, index) => {
        const author = `${run}${command.tag * 1000 + index}x`;
        const seen = new Set<string>();
        // Keystrokes are read off the raw message, which is far cheaper than a text delta per
        // client, and stamped in a microtask: after the provider has applied the message.
        const onMessage = (data: Buffer) => {
          if (!data.includes(marker)) return;
          const tokens = [...data.toString("latin1").matchAll(TOKEN)].map((match) => match[1]).filter((token) => token.startsWith(run) && !token.startsWith(author) && !seen.has(token));
          if (tokens.length === 0) return;
          for (const token of tokens) seen.add(token);
          queueMicrotask(() => {
            const at = now();
            for (const token of tokens) received.push([token, at, person.editor]);
          });
        };
        const client = (person.editor ? joinRoom : followRoom)(command.baseUrl, command.id, person.cookie, { onMessage });
        client.analysis.observe(() => structureSeen(index));
        return { client, editor: person.editor, author, typed: 0 };
      });
      await Promise.all(rooms.map((r) => r.client.synced));
      while (rooms.some((r) => r.client.analysis.get("species") === undefined)) await sleep(20);
      report({ type: "joined", species: rooms[0].client.analysis.get("species") as number });
    } else if (command.type === "type") {
      const sent: [string, number][] = [];
      const typists = rooms.filter((r) => r.editor).slice(0, command.typists);
      await Promise.all(
        typists.map(async (typist) => {
          await sleep(Math.random() * command.periodMs);
          for (let i = 0; i < command.count; i++) {
            const token = `${typist.author}${typist.typed++}`;
            sent.push([token, now()]);
            typist.client.text.insert(typist.client.text.length, `k${token};`);
            await sleep(command.periodMs * (0.75 + Math.random() / 2));
          }
        }),
      );
      report({ type: "typed", sent });
    } else if (command.type === "watch") {
      const allSeen = new Promise<void>((resolve) => {
        watching = { expected: command.expected, at: rooms.map(() => null), allSeen: resolve };
      });
      rooms.forEach((_, index) => structureSeen(index));
      await Promise.race([allSeen, sleep(command.timeoutMs)]);
      report({ type: "seen", n: command.n, at: watching!.at });
      watching = null;
    } else if (command.type === "edit") {
      const editor = rooms.find((r) => r.editor)!.client;
      const at = now();
      editor.text.insert(0, `Z${command.n} -> S1 @ 1\n`);
      report({ type: "edited", n: command.n, at });
    } else if (command.type === "reset") {
      calibrateClock();
      received.length = 0;
      cpuAtStart = process.cpuUsage();
      report({ type: "reset" });
    } else if (command.type === "collect") {
      for (const { client } of rooms) client.close();
      const { user, system } = process.cpuUsage(cpuAtStart);
      process.send!({ type: "received", keystrokes: received, cpuMs: (user + system) / 1000 } satisfies Report, () => process.exit(0));
    }
  });
}

await clientProcess();
