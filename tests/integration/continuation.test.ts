// Continuation over HTTP on a real server: a viewer may run it (it changes nothing), a stranger
// or a signed-out caller may not, and bad options are refused with the schema's words.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let viewer: Client;
let stranger: Client;
let path: string;

const source = "fixed [A] = 1\nfixed [B] = 3\nA -> X @ 1\n2X + Y -> 3X @ 1\nB + X -> Y + D @ 1\nX -> E @ 1\nfixed [D] = 0\nfixed [E] = 0\n";
const job = (options: object) => ({ kind: "continuation", source, options });

beforeAll(async () => {
  server = await startTestServer();
  const owner = await signUp(server.url, "Branch Owner");
  const reader = await signUp(server.url, "Branch Viewer");
  stranger = await signUp(server.url, "Branch Stranger");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Brusselator", source })).json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: reader.email, role: "viewer" });
  viewer = reader;
  path = `/api/v1/mechanisms/${id}/dynamics`;
}, 60_000);
afterAll(() => server?.dispose());

describe("continuation over HTTP", { timeout: 120_000 }, () => {
  it("a viewer follows the Brusselator's equilibria through its Hopf point at b = 1 + a² = 2", async () => {
    const response = await viewer.json(path, "POST", job({ target: { kind: "fixed", species: "B" }, from: 1, to: 3 }));
    expect(response.status).toBe(200);
    const result = await response.json();
    expect(result.bifurcations).toHaveLength(1);
    expect(result.bifurcations[0].kind).toBe("hopf");
    expect(result.bifurcations[0].value).toBeCloseTo(2, 8);
    expect(result.points[0]).toEqual({ value: 1, state: { X: 1, Y: 1 }, stable: true });
  });

  it("a stranger gets 404 and a signed-out caller 401", async () => {
    const options = { target: { kind: "fixed", species: "B" }, from: 1, to: 3 };
    expect((await stranger.json(path, "POST", job(options))).status).toBe(404);
    expect((await new Client(server.url).json(path, "POST", job(options))).status).toBe(401);
  });

  it("refuses an empty range, a reaction by index and a name the text lacks, saying why", async () => {
    const empty = await viewer.json(path, "POST", job({ target: { kind: "fixed", species: "B" }, from: 2, to: 2 }));
    expect(empty.status).toBe(400);
    expect((await empty.json()).error).toMatch(/two different non-negative numbers/);
    const byIndex = await viewer.json(path, "POST", job({ target: { kind: "rate", reaction: 0 }, from: 1, to: 2 }));
    expect(byIndex.status).toBe(400);
    const unknown = await viewer.json(path, "POST", job({ target: { kind: "fixed", species: "Q" }, from: 1, to: 2 }));
    expect(unknown.status).toBe(400);
    expect((await unknown.json()).error).toMatch(/no held \(fixed\) species Q/);
  });
});
