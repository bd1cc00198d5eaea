// A stochastic ensemble over HTTP: the instance splits it into ranges of runs, one queued job each,
// which the consumer's lanes run at once; merged, they give exactly what one process computes
// alone (each run is seeded by its index). Progress streams as runs finish, a caller that leaves
// cancels every range, and the mechanism's roles apply as to every dynamics job.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runJob } from "../../server/sim/job";
import { query } from "../support/database";
import { createMechanism, signUp, type Client } from "../support/http";
import { firstLine, lines } from "../support/long-jobs";
import { startTestServer } from "../support/server";

const source = "make: 0 -> X @ k = 5\ndecay: X -> 0 @ g = 1\ndimer: 2X -> D @ 0.01\n[X]0 = 1\n";
const settings = { until: 5, samples: 6, volume: 4, runs: 41, seed: 2026 };

let server: Awaited<ReturnType<typeof startTestServer>>;
let chemist: Client;
let path: string;

beforeAll(async () => {
  server = await startTestServer();
  chemist = await signUp(server.url, "Stochastic Chemist");
  path = `/api/v1/mechanisms/${await createMechanism(chemist, source, "Birth, death and dimers")}/dynamics`;
}, 120_000);
afterAll(() => server?.dispose());

const streamed = (client: Client, body: object, signal?: AbortSignal) =>
  client.request(path, { method: "POST", headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" }, body: JSON.stringify(body), signal });

describe("stochastic ensembles as jobs", { timeout: 180_000 }, () => {
  it("split over the lanes, answer exactly what one process computes", async () => {
    const response = await streamed(chemist, { kind: "stochastic", source, settings });
    expect(response.status).toBe(200);
    const received: { progress?: number; result?: Record<string, unknown> }[] = [];
    for await (const line of lines(response)) received.push(line as (typeof received)[number]);
    // Progress lines may all arrive after a run this short has ended; the cancel test below waits for one.
    const result = received.at(-1)!.result!;
    const alone = runJob({ kind: "stochastic", model: { kind: "text", source }, settings });
    expect(result.mean).toEqual(alone.mean);
    expect(result.variance).toEqual(alone.variance);
    expect(result.paths).toEqual(alone.paths);
    expect(result.stats).toMatchObject({ runs: 41, events: alone.stats.events, volume: 4 });
  });

  it("refuses hostile settings with 400 and a stranger with 404", async () => {
    for (const bad of [{ runs: 0 }, { runs: 1e9 }, { volume: 0 }, { volume: -1 }, { seed: 1.5 }]) {
      const response = await chemist.json(path, "POST", { kind: "stochastic", source, settings: { ...settings, ...bad } });
      expect(response.status).toBe(400);
      expect((await response.json()).error).toMatch(/runs|volume|seed/);
    }
    const stranger = await signUp(server.url, "Stranger");
    expect((await stranger.json(path, "POST", { kind: "stochastic", source, settings })).status).toBe(404);
  });

  it("cancels every range when the caller goes away", async () => {
    const leaving = new AbortController();
    const long = { ...settings, until: 1e4, volume: 200, runs: 200, maxEvents: 1e9 };
    const response = await streamed(chemist, { kind: "stochastic", source, settings: long }, leaving.signal);
    expect(await firstLine(response)).toEqual({ progress: expect.any(Number) });
    leaving.abort();
    const deadline = Date.now() + 60_000;
    for (;;) {
      const { rows } = await query(server.databaseUrl, "select state from pgboss.job where data->'job'->>'kind' = 'stochasticRange' and state in ('created', 'active')");
      if (rows.length === 0) break;
      if (Date.now() > deadline) throw new Error(`ranges still ${rows.map((row) => row.state).join(", ")} a minute after the caller left`);
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
  });
});
