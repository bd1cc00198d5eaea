// A room across two app instances on loopback (own PostgreSQL cluster, two server processes on one
// database). Target from issue 15: a keystroke reaches an editor on the *other* instance with
// p95 < 100 ms. The same keystrokes to an editor on the typist's own instance are the baseline.
// Both editors live in this process, so times need no clock shared across processes.
// Run after a build (npm run build): npx tsx tests/bench/collab-instances.ts
import { eventually, joinRoom } from "../support/collab-client";
import { signUp } from "../support/http";
import { startInstance, startTestServer } from "../support/server";
import { summary, withBenchCluster } from "./bench-support";

const KEYSTROKES = 400;
/** A brisk typist: a key every 60 ms or so. */
const TYPING_INTERVAL_MS = 60;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function run(firstUrl: string, secondUrl: string) {
  const owner = await signUp(firstUrl, "Bench Owner");
  const response = await owner.json("/api/v1/mechanisms", "POST", { title: "Across instances", source: "A -> B @ 1\n# notes: " });
  const { id } = (await response.json()) as { id: string };
  const typist = joinRoom(firstUrl, id, owner.cookieHeader);
  const sameInstance = joinRoom(firstUrl, id, owner.cookieHeader);
  const otherInstance = joinRoom(secondUrl, id, owner.cookieHeader);
  const readers = [sameInstance, otherInstance];
  await Promise.all([typist, ...readers].map((r) => r.synced));

  const latencies = readers.map(() => [] as number[]);
  for (let key = 0; key < KEYSTROKES; key++) {
    const expected = typist.text.length + 1;
    const typed = performance.now();
    const arrivals = readers.map(
      (reader, index) =>
        new Promise<void>((resolve) => {
          const seen = () => {
            if (reader.text.length < expected) return;
            latencies[index].push(performance.now() - typed);
            reader.text.unobserve(seen);
            resolve();
          };
          reader.text.observe(seen);
        }),
    );
    typist.text.insert(typist.text.length, "abcdefghij"[key % 10]);
    await Promise.all(arrivals);
    await sleep(TYPING_INTERVAL_MS * (0.5 + Math.random()));
  }
  await eventually("every reader to hold the text", () => readers.every((r) => r.text.toString() === typist.text.toString()));
  console.log(`Keystroke → editor, ${KEYSTROKES} keys, two instances on one database:`);
  summary("same instance (baseline)", latencies[0], 100);
  summary("other instance (update row → NOTIFY → read → relay)", latencies[1], 100);
  // Both readers see each keystroke, so the difference is the crossing alone: a stall of the
  // whole machine delays both and cancels out.
  summary("crossing alone (other − same, keystroke by keystroke)", latencies[1].map((ms, key) => ms - latencies[0][key]), 100);
  for (const room of [typist, ...readers]) room.close();
}

await withBenchCluster("bench-instances", 55481, async () => {
  const env = { NODE_ENV: "production" };
  const first = await startTestServer(env);
  const second = await startInstance(first.databaseUrl, env);
  try {
    await run(first.url, second.url);
  } finally {
    await second.stop();
    await first.dispose();
  }
});
