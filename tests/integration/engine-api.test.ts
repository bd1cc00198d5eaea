// The structure engine and the integrator behind the JSON API, through real HTTP.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let owner: Awaited<ReturnType<typeof signUp>>;
let viewer: Awaited<ReturnType<typeof signUp>>;
let mechanismId: string;

// Textbook Michaelis–Menten scheme E + S ⇌ C → E + P: 4 complexes... here with numbers.
const michaelisMenten = "E + S <=> C @ 1.0, 0.5\nC -> E + P @ 0.3\n[E]0 = 0.1\n[S]0 = 1\n";

beforeAll(async () => {
  server = await startTestServer();
  owner = await signUp(server.url, "Engine Owner");
  viewer = await signUp(server.url, "Engine Viewer");
  ({ id: mechanismId } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Enzyme", source: michaelisMenten })).json());
  await owner.post(`/m/${mechanismId}/members`, { intent: "add", email: viewer.email, role: "viewer" });
});
afterAll(() => server?.dispose());

describe("POST /api/v1/analyze", () => {
  it("returns the analyze contract for a signed-in caller", async () => {
    const response = await owner.json("/api/v1/analyze", "POST", { source: michaelisMenten });
    expect(response.status).toBe(200);
    const report = await response.json();
    expect(report.species).toEqual(["E", "S", "C", "P"]);
    expect(report.complexes).toEqual(["E + S", "C", "E + P"]);
    expect(report.deficiency).toBe(0);
    expect(report.rank).toBe(2);
    expect(report.theorems.deficiencyZero.applies).toBe(true);
  });

  it("lists errors with lines and refuses oversized input", async () => {
    const report = await (await owner.json("/api/v1/analyze", "POST", { source: "A -> B @ 1\nC -> @ 2\n" })).json();
    expect(report.diagnostics.some((d: { severity: string; line: number }) => d.severity === "error" && d.line === 2)).toBe(true);
    const huge = await owner.json("/api/v1/analyze", "POST", { source: "# " + "x".repeat(1024 * 1024 + 10) });
    expect(huge.status).toBe(413);
    expect(await huge.json()).toEqual({ error: expect.any(String), code: "too_large" });
    expect((await new Client(server.url).json("/api/v1/analyze", "POST", { source: "A -> B" })).status).toBe(401);
  });

  it("analyses a large text in a worker thread with the same result", async () => {
    // A chain S1 -> S2 -> … of 1,500 steps: one linkage class, deficiency 0.
    const source = Array.from({ length: 1500 }, (_, i) => `S${i + 1} -> S${i + 2} @ 1`).join("\n") + "\n";
    const report = await (await owner.json("/api/v1/analyze", "POST", { source })).json();
    expect(report.complexes).toHaveLength(1501);
    expect(report.linkageClasses).toHaveLength(1);
    expect(report.rank).toBe(1500);
    expect(report.deficiency).toBe(0);
  });

  it("GET /api/v1/mechanisms/:id includes the analysis", async () => {
    const body = await (await viewer.get(`/api/v1/mechanisms/${mechanismId}`)).json();
    expect(body.analysis.deficiency).toBe(0);
    expect(body.analysis.linkageClasses).toEqual([[0, 1, 2]]);
  });
});

describe("POST /api/v1/mechanisms/:id/simulations", () => {
  it("simulates for a viewer, conserving the enzyme total", async () => {
    const response = await viewer.json(`/api/v1/mechanisms/${mechanismId}/simulations`, "POST", { until: 50, samples: 11 });
    expect(response.status).toBe(200);
    const { t, series, stats } = await response.json();
    expect(t).toHaveLength(11);
    expect(t[10]).toBe(50);
    for (let i = 0; i < t.length; i++) expect(series.E[i] + series.C[i]).toBeCloseTo(0.1, 8);
    expect(stats.steps).toBeGreaterThan(0);
  });

  it("streams progress lines and then the result when asked", async () => {
    const response = await viewer.request(`/api/v1/mechanisms/${mechanismId}/simulations`, {
      method: "POST",
      headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
      body: JSON.stringify({ until: 100, samples: 201 }),
    });
    const lines = (await response.text()).trim().split("\n").map((l) => JSON.parse(l));
    expect(lines.at(-1).result.t).toHaveLength(201);
    expect(lines.slice(0, -1).every((l) => typeof l.progress === "number")).toBe(true);
  });

  it("refuses bad settings and a mechanism without rates, with a clear message", async () => {
    const bad = await viewer.json(`/api/v1/mechanisms/${mechanismId}/simulations`, "POST", { until: -1, samples: 11 });
    expect(bad.status).toBe(400);
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "No rates", source: "A -> B\n[A]0 = 1\n" })).json();
    const missing = await owner.json(`/api/v1/mechanisms/${id}/simulations`, "POST", { until: 1, samples: 3 });
    expect(missing.status).toBe(400);
    expect((await missing.json()).error).toMatch(/rate/i);
  });
});

describe("POST /api/v1/mechanisms/:id/dynamics, kind equilibrium", () => {
  it("lists every equilibrium of a bistable network in its class, with stability, beside the old fields", async () => {
    // x' = −(x − 1)(x − 2)(x − 3) as mass action (worked by hand): stable 1 and 3, unstable 2.
    const source = "2X -> 3X @ 6\n3X -> 2X @ 1\n0 -> X @ 6\nX -> 0 @ 11\n[X]0 = 0.5\n";
    const response = await viewer.json(`/api/v1/mechanisms/${mechanismId}/dynamics`, "POST", { kind: "equilibrium", source, options: {} });
    expect(response.status).toBe(200);
    const result = await response.json();
    expect(result).toMatchObject({ converged: true, stability: "stable", classDimension: 1 });
    expect(result.state.X).toBeCloseTo(1, 8);
    const found = result.equilibria.map((e: { state: { X: number }; stability: string }) => [Math.round(e.state.X * 1e6) / 1e6, e.stability]);
    expect(found.sort()).toEqual([[1, "stable"], [2, "unstable"], [3, "stable"]]);
  });

  it("reports the analysis's compatibility class: E + C and S + C + P at their initial totals", async () => {
    const report = await (await owner.json("/api/v1/analyze", "POST", { source: michaelisMenten })).json();
    expect(report.compatibilityClass).toEqual({ dimension: 2, totals: [0.1, 1] });
  });
});
