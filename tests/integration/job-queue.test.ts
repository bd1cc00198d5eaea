// Dynamics jobs cross processes through the queue in PostgreSQL: an app instance started with
// JOBS=off runs none itself, and a separate worker process (`npm run worker`, from its bundle)
// runs what the API asks for, with progress, cancellation and the per-user limits intact.
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { query } from "../support/database";
import { signUp } from "../support/http";
import { expectFairShare, firstLine, lines, oscillator, streamLongSweep } from "../support/long-jobs";
import { startTestServer, startTestWorker, type TestWorker } from "../support/server";

const lorenz = readFileSync(new URL("../fixtures/ode/lorenz.ode", import.meta.url), "utf8");
const quickRun = { ode: lorenz, settings: { until: 1, samples: 10 } };

let server: Awaited<ReturnType<typeof startTestServer>>;
let worker: TestWorker;

beforeAll(async () => {
  // One core each: the worker runs two jobs at once (WorkerBudget.jobsAtOnce).
  server = await startTestServer({ JOBS: "off", WORKER_THREADS: "1" });
  worker = await startTestWorker(server.databaseUrl, { WORKER_THREADS: "1" });
}, 120_000);
afterAll(async () => {
  await worker?.stop();
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

  it("keeps the per-user limits when the worker is another process", () => expectFairShare(server.url));

  it("stops the worker's runs when their callers go away, freeing its lanes for others", async () => {
    const [first, second, third] = await Promise.all(["Leaving One", "Leaving Two", "Staying Three"].map((name) => signUp(server.url, name)));
    const leaving = new AbortController();
    for (const chemist of [first, second]) {
      const { id } = await (await chemist.json("/api/v1/mechanisms", "POST", { title: "Long", source: oscillator })).json();
      const running = await streamLongSweep(chemist, `/api/v1/mechanisms/${id}/dynamics`, leaving.signal);
      // Its first progress line: the worker has started it, so both of its lanes are taken.
      expect(await firstLine(running)).toEqual({ progress: expect.any(Number) });
    }
    leaving.abort();
    const started = performance.now();
    const response = await third.json("/api/v1/simulations", "POST", quickRun);
    expect(response.status).toBe(200);
    expect((await response.json()).stats.ranOn).toBe(worker.id);
    // Each long sweep holds a lane for a minute or more: the quick run got one because they stopped.
    expect(performance.now() - started).toBeLessThan(30_000);
    const { rows } = await query(server.databaseUrl, "select state, count(*)::int as jobs from pgboss.job where state in ('active', 'cancelled') group by state");
    expect(rows).toContainEqual({ state: "cancelled", jobs: expect.any(Number) });
    expect(rows.find((row) => row.state === "active")).toBeUndefined();
  });
});
