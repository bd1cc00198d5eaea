// Dynamics jobs cross processes through the queue in PostgreSQL: an app instance started with
// JOBS=off runs none itself, and a separate worker process (`npm run worker`, from its bundle)
// runs what the API asks for, with progress, cancellation and the per-user limits intact.
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { query } from "../support/database";
import { signUp } from "../support/http";
import { expectFairShare, firstLineAfterWaiting, lines, oscillator, streamLongSweep } from "../support/long-jobs";
import { startInstance, startTestServer, startTestWorker, type TestServer, type TestWorker } from "../support/server";

const lorenz = readFileSync(new URL("../fixtures/ode/lorenz.ode", import.meta.url), "utf8");
const quickRun = { ode: lorenz, settings: { until: 1, samples: 10 } };

let server: Awaited<ReturnType<typeof startTestServer>>;
let second: TestServer;
let worker: TestWorker;

beforeAll(async () => {
  // One core each: the worker runs two jobs at once (WorkerBudget.jobsAtOnce).
  server = await startTestServer({ JOBS: "off", WORKER_THREADS: "1" });
  second = await startInstance(server.databaseUrl, { JOBS: "off", WORKER_THREADS: "1" });
  worker = await startTestWorker(server.databaseUrl, { WORKER_THREADS: "1" });
}, 120_000);
afterAll(async () => {
  await worker?.stop();
  await second?.stop();
  await server?.dispose();
});

describe("jobs on the queue, run by a worker process", { timeout: 180_000 }, () => {
  it("runs a simulation asked of the app instance on the worker, which signs it with its id", async () => {
    const chemist = await signUp(server.url, "Queue Chemist");
    const response = await chemist.json("/api/v1/simulations", "POST", quickRun);
    expect(response.status).toBe(200);
    const result = await response.json();
    expect(result.stats.ranOn).toBe(worker.id);
    expect(result.t).toHaveLength(10);
  });

  it("streams the worker's progress and then its result", async () => {
    const chemist = await signUp(server.url, "Streaming Chemist");
    const response = await chemist.request("/api/v1/simulations", {
      method: "POST",
      headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
      body: JSON.stringify(quickRun),
    });
    const received = [];
    for await (const line of lines(response)) received.push(line);
    expect(received.some((line) => typeof (line as { progress?: unknown }).progress === "number")).toBe(true);
    expect(received.at(-1)).toMatchObject({ result: { stats: { ranOn: worker.id } } });
  });

  it("keeps the per-user limits when the worker is another process and the requests go to two instances", () => expectFairShare(server.url, second.url));

  it("tells a job behind other users' jobs its place, and stops the worker's runs when their callers go away", async () => {
    const [first, next, third] = await Promise.all(["Leaving One", "Leaving Two", "Staying Three"].map((name) => signUp(server.url, name)));
    const leaving = new AbortController();
    for (const chemist of [first, next]) {
      const { id } = await (await chemist.json("/api/v1/mechanisms", "POST", { title: "Long", source: oscillator })).json();
      const running = await streamLongSweep(chemist, `/api/v1/mechanisms/${id}/dynamics`, leaving.signal);
      // Its first progress line: the worker has started it, so both of its lanes are taken.
      expect(await firstLineAfterWaiting(running)).toEqual({ progress: expect.any(Number) });
    }
    // Asked of the other instance: it waits for a lane, and says so instead of going quiet.
    const waiting = await third.at(second.url).request("/api/v1/simulations", {
      method: "POST",
      headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
      body: JSON.stringify(quickRun),
    });
    const received = lines(waiting);
    expect((await received.next()).value).toEqual({ queued: 1 });
    leaving.abort();
    let last: unknown;
    for await (const line of received) last = line;
    expect(last).toMatchObject({ result: { stats: { ranOn: worker.id } } });
    const { rows } = await query(server.databaseUrl, "select state, count(*)::int as jobs from pgboss.job where state in ('active', 'cancelled') group by state");
    expect(rows).toContainEqual({ state: "cancelled", jobs: expect.any(Number) });
    expect(rows.find((row) => row.state === "active")).toBeUndefined();
  });
});
