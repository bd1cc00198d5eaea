// The multistationarity witness search as a queued job over HTTP on a real server: a viewer may
// run it (it changes nothing) and hears its progress, a stranger gets 404, a signed-out caller 401,
// and hostile options are refused with the schema's words.
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let viewer: Client;
let stranger: Client;
let path: string;

const source = readFileSync(new URL("../fixtures/two-site-phosphorylation.weave", import.meta.url), "utf8");
const job = (options: unknown) => ({ kind: "witness", source, options });

beforeAll(async () => {
  server = await startTestServer();
  const owner = await signUp(server.url, "Witness Owner");
  const reader = await signUp(server.url, "Witness Viewer");
  stranger = await signUp(server.url, "Witness Stranger");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Two-site phosphorylation", source })).json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: reader.email, role: "viewer" });
  viewer = reader;
  path = `/api/v1/mechanisms/${id}/dynamics`;
}, 60_000);
afterAll(() => server?.dispose());

describe("the witness search as a job", { timeout: 120_000 }, () => {
  it("a viewer runs it, hears progress, and gets a witness whose steady states check out", async () => {
    const response = await viewer.request(path, {
      method: "POST",
      headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
      body: JSON.stringify(job({ budgetMs: 20_000 })),
    });
    expect(response.status).toBe(200);
    const lines = (await response.text()).trim().split("\n").map((line) => JSON.parse(line));
    const { result } = lines.at(-1);
    expect(lines.slice(0, -1).every((line) => typeof line.progress === "number" || typeof line.queued === "number")).toBe(true);
    expect(result.multistationarity.verdict).toBe("possible");
    const { rates, equilibria } = result.multistationarity.witness;
    expect(rates).toHaveLength(result.reactions.length);
    expect(equilibria.length).toBeGreaterThanOrEqual(2);
    expect(result.checks).toHaveLength(equilibria.length);
    for (const check of result.checks) {
      expect(check.residual).toBeLessThan(1e-8);
      check.totals.forEach((total: number, k: number) => expect(total).toBeCloseTo(result.checks[0].totals[k], 6));
    }
  });

  it("a stranger gets 404 and a signed-out caller 401", async () => {
    expect((await stranger.json(path, "POST", job({ budgetMs: 1000 }))).status).toBe(404);
    expect((await new Client(server.url).json(path, "POST", job({ budgetMs: 1000 }))).status).toBe(401);
  });

  it("refuses hostile budgets and missing options, saying why", async () => {
    for (const options of [{ budgetMs: 1e9 }, { budgetMs: -1 }, { budgetMs: 1.5e3 + 0.5 }, { budgetMs: "20000" }, {}, null]) {
      const response = await viewer.json(path, "POST", job(options));
      expect(response.status).toBe(400);
      expect((await response.json()).error).toMatch(/budget|options|expected/i);
    }
  });
});
