// Data sets and fits of a mechanism through the API on a real server and PostgreSQL: upload
// limits and hostile input change nothing, roles are checked on the server, a fit is stored with
// the version it ran on, applying it names a version, and everything goes with the mechanism.
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { MAX_CSV_BYTES } from "~/chem/limits";
import { addMember, createMechanism, signUp, type Client } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let owner: Client & { email: string };
let editor: Client & { email: string };
let viewer: Client & { email: string };
let stranger: Client & { email: string };
let id: string;

const source = `# Two first-order steps in a row.
first: A -> B @ k1 = 0.3
second: B -> C @ k2 = 0.1
[A]0 = 1
`;

/** A → B → C solved in closed form (Bateman), so the data owe nothing to our integrator. */
function consecutiveCsv(k1: number, k2: number, a0: number, times: number[]): string {
  const rows = times.map((t) => {
    const a = a0 * Math.exp(-k1 * t);
    const b = ((a0 * k1) / (k2 - k1)) * (Math.exp(-k1 * t) - Math.exp(-k2 * t));
    return `${t},${a.toPrecision(10)},${b.toPrecision(10)}`;
  });
  return [`# [A]0 = ${a0}`, "time,A,B", ...rows].join("\n") + "\n";
}
const times = Array.from({ length: 25 }, (_, i) => i * 0.8);

const upload = (client: Client, mechanismId: string, name: string, body: BodyInit, type = "text/csv") =>
  client.request(`/api/v1/mechanisms/${mechanismId}/data-sets?name=${encodeURIComponent(name)}`, { method: "POST", headers: { "Content-Type": type }, body });
const dataSets = async (client: Client, mechanismId: string) => ((await (await client.get(`/api/v1/mechanisms/${mechanismId}/data-sets`)).json()) as { dataSets: { id: string; name: string }[] }).dataSets;

beforeAll(async () => {
  server = await startTestServer();
  owner = await signUp(server.url, "Fit Owner");
  stranger = await signUp(server.url, "Fit Stranger");
  id = await createMechanism(owner, source, "Consecutive steps");
  editor = await addMember(owner, id, "editor", "Fit Editor");
  viewer = await addMember(owner, id, "viewer", "Fit Viewer");
}, 120_000);
afterAll(() => server?.dispose());

describe("data sets", () => {
  it("editors upload, everyone in the mechanism reads, strangers see nothing", async () => {
    const stored = await upload(editor, id, "run 1", consecutiveCsv(0.5, 0.2, 1, times));
    expect(stored.status).toBe(201);
    const body = await stored.json();
    expect(body.dataSet).toMatchObject({ name: "run 1", columns: ["A", "B"], rows: times.length, uploadedBy: "Fit Editor" });
    expect((await dataSets(viewer, id)).map((d) => d.name)).toEqual(["run 1"]);
    const csv = await viewer.get(`/api/v1/mechanisms/${id}/data-sets/${body.dataSet.id}`);
    expect(await csv.text()).toContain("time,A,B");
    expect((await stranger.get(`/api/v1/mechanisms/${id}/data-sets`)).status).toBe(404);
    expect((await upload(viewer, id, "viewer's", consecutiveCsv(0.5, 0.2, 1, times))).status).toBe(403);
    expect((await upload(stranger, id, "stranger's", consecutiveCsv(0.5, 0.2, 1, times))).status).toBe(404);
  });

  it("refuses oversized, NUL-bearing, malformed and mistyped uploads with a clear message and stores nothing", async () => {
    const before = (await dataSets(owner, id)).length;
    const oversized = await upload(editor, id, "huge", "time,A\n" + "1,1\n".repeat(MAX_CSV_BYTES / 4));
    expect(oversized.status).toBe(413);
    expect((await oversized.json()).code).toBe("too_large");
    const nul = await upload(editor, id, "nul", "time,A\n0,1\u0000\n1,0.5\n");
    expect(nul.status).toBe(400);
    expect((await nul.json()).error).toMatch(/control character U\+0000/);
    const noTime = await upload(editor, id, "no time", "minute,A\n0,1\n");
    expect(noTime.status).toBe(400);
    expect((await noTime.json()).error).toMatch(/time/);
    const notNumber = await upload(editor, id, "letters", "time,A\n0,1\n1,lots\n");
    expect((await notNumber.json()).error).toMatch(/line 3.*"lots" is not a number/);
    const backwards = await upload(editor, id, "backwards", "time,A\n1,1\n0,0.5\n");
    expect((await backwards.json()).error).toMatch(/times must increase/);
    expect((await upload(editor, id, "latin-1", new Uint8Array([0x74, 0x69, 0x6d, 0x65, 0x0a, 0xff, 0xfe]))).status).toBe(400);
    expect((await upload(editor, id, "", "time,A\n0,1\n")).status).toBe(400);
    expect((await upload(editor, id, "as json", JSON.stringify({ csv: "time,A\n0,1\n" }), "application/json")).status).toBe(415);
    expect((await dataSets(owner, id)).length).toBe(before);
  });

  it("keeps ids inside their mechanism: another mechanism's data set is not found, and survives", async () => {
    const other = await createMechanism(stranger, source, "Someone else's");
    const theirs = (await (await upload(stranger, other, "theirs", consecutiveCsv(0.5, 0.2, 1, times))).json()).dataSet.id as string;
    expect((await editor.request(`/api/v1/mechanisms/${id}/data-sets/${theirs}`, { method: "DELETE" })).status).toBe(404);
    expect((await editor.get(`/api/v1/mechanisms/${id}/data-sets/${theirs}`)).status).toBe(404);
    const fit = await editor.json(`/api/v1/mechanisms/${id}/fits`, "POST", { dataSets: [theirs], vary: ["k1"] });
    expect(fit.status).toBe(404);
    expect((await fit.json()).error).toMatch(/No data set/);
    expect((await editor.json(`/api/v1/mechanisms/${id}/fits`, "POST", { dataSets: ["not-a-uuid"], vary: ["k1"] })).status).toBe(400);
    expect((await dataSets(stranger, other)).map((d) => d.id)).toEqual([theirs]);
    expect((await editor.get(`/api/v1/mechanisms/${other}/fits`)).status).toBe(404);
  });
});

describe("fits", () => {
  let fitId: string;
  let versionId: number;

  it("viewers may not run a fit", async () => {
    const [first] = await dataSets(viewer, id);
    expect((await viewer.json(`/api/v1/mechanisms/${id}/fits`, "POST", { dataSets: [first.id], vary: ["k1"] })).status).toBe(403);
  });

  it("recovers the coefficients of closed-form data and stores the fit with the version it ran on", async () => {
    expect((await upload(editor, id, "run 2", consecutiveCsv(0.5, 0.2, 2, times))).status).toBe(201);
    versionId = (await (await owner.json(`/api/v1/mechanisms/${id}/snapshots`, "POST", { name: "before fitting" })).json()).snapshot.id;
    const chosen = (await dataSets(editor, id)).map((d) => d.id).reverse();
    const response = await editor.json(`/api/v1/mechanisms/${id}/fits`, "POST", { dataSets: chosen, vary: ["k1", "k2"] });
    expect(response.status).toBe(200);
    const result = await response.json();
    fitId = result.id;
    expect(result.snapshotId).toBe(versionId);
    expect(result.converged).toBe(true);
    expect(result.parameters.k1.value).toBeCloseTo(0.5, 4);
    expect(result.parameters.k2.value).toBeCloseTo(0.2, 4);
    expect(Object.keys(result.correlation)).toEqual(["k1", "k2"]);
    const { fits } = await (await viewer.get(`/api/v1/mechanisms/${id}/fits`)).json();
    expect(fits[0]).toMatchObject({ id: fitId, status: "done", snapshotId: versionId, ranBy: "Fit Editor" });
    expect(fits[0].settings.dataSets.map((d: { name: string }) => d.name)).toEqual(["run 1", "run 2"]);
    const { fit } = await (await viewer.get(`/api/v1/mechanisms/${id}/fits/${fitId}`)).json();
    expect(fit.source).toBe(source);
  }, 60_000);

  it("streams each iteration's cost, falling, before the result", async () => {
    const chosen = (await dataSets(editor, id)).map((d) => d.id);
    const response = await editor.request(`/api/v1/mechanisms/${id}/fits`, {
      method: "POST",
      headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
      body: JSON.stringify({ dataSets: chosen, vary: ["k1", "k2"] }),
    });
    const lines = (await response.text()).trim().split("\n").map((line) => JSON.parse(line));
    // Events may overtake one another between processes: the iteration number puts them in order.
    const notes = lines.flatMap((line) => (line.note ? [line.note as { iteration: number; cost: number }] : [])).sort((a, b) => a.iteration - b.iteration);
    expect(notes.length).toBeGreaterThan(1);
    expect(new Set(notes.map((note) => note.iteration)).size).toBe(notes.length);
    expect(notes.at(-1)!.cost).toBeLessThan(notes[0].cost);
    expect(lines.at(-1).result.cost).toBeCloseTo(notes.at(-1)!.cost, 6);
  }, 60_000);

  it("a fit that cannot run is stored as failed with its reason", async () => {
    const [first] = await dataSets(editor, id);
    const response = await editor.json(`/api/v1/mechanisms/${id}/fits`, "POST", { dataSets: [first.id], vary: ["no_such_parameter"] });
    expect(response.status).toBe(400);
    const { fits } = await (await editor.get(`/api/v1/mechanisms/${id}/fits`)).json();
    expect(fits[0]).toMatchObject({ status: "failed", error: expect.stringMatching(/no_such_parameter/) });
  });

  it("viewers may not apply; an editor's apply writes the values and names the version", async () => {
    expect((await viewer.request(`/api/v1/mechanisms/${id}/fits/${fitId}/apply`, { method: "POST" })).status).toBe(403);
    const applied = await editor.request(`/api/v1/mechanisms/${id}/fits/${fitId}/apply`, { method: "POST" });
    expect(applied.status).toBe(201);
    const body = await applied.json();
    expect(body.snapshot.name).toBe("fitted to run 1 and run 2");
    const { mechanism } = { mechanism: await (await viewer.get(`/api/v1/mechanisms/${id}`)).json() };
    expect(mechanism.source).toMatch(/k1 = 0\.5\d*\n/);
    expect(mechanism.source).toMatch(/k2 = 0\.(2|19999)\d*\n/);
    expect(mechanism.source.startsWith("# Two first-order steps in a row.\nfirst: A -> B @ k1 = ")).toBe(true);
    const { snapshots } = await (await viewer.get(`/api/v1/mechanisms/${id}/snapshots`)).json();
    expect(snapshots[0]).toMatchObject({ kind: "named", name: "fitted to run 1 and run 2", author: "Fit Editor" });
  });

  it("sensitivities answer the CLI's shape for viewers", async () => {
    const response = await viewer.json(`/api/v1/mechanisms/${id}/sensitivities`, "POST", { until: 10, samples: 11 });
    expect(response.status).toBe(200);
    const result = await response.json();
    expect(result.t).toHaveLength(11);
    expect(Object.keys(result.normalized.A)).toEqual(["k1", "k2"]);
    // ∂ln A/∂ln k1 = −k1·t for A = e^{−k1 t}: independent of the integrator.
    const k1 = Number(/k1 = ([\d.e-]+)/.exec((await (await viewer.get(`/api/v1/mechanisms/${id}`)).json()).source)![1]);
    expect(result.normalized.A.k1[10]).toBeCloseTo(-k1 * 10, 2);
  });
});

describe("deleting the mechanism", () => {
  it("deletes its data sets and fits", async () => {
    const db = new pg.Client(server.databaseUrl);
    await db.connect();
    try {
      const count = async (table: string) => Number((await db.query(`SELECT count(*) FROM ${table} WHERE mechanism_id = $1`, [id])).rows[0].count);
      expect(await count("data_sets")).toBeGreaterThan(0);
      expect(await count("fits")).toBeGreaterThan(0);
      expect((await owner.post(`/m/${id}`, { intent: "delete" })).status).toBe(302);
      expect(await count("data_sets")).toBe(0);
      expect(await count("fits")).toBe(0);
    } finally {
      await db.end();
    }
  });
});
