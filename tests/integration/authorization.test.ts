// Walks every route and API endpoint with each role and checks the status the server gives.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

type Caller = "owner" | "editor" | "viewer" | "stranger" | "signedOut";
const callers: Caller[] = ["owner", "editor", "viewer", "stranger", "signedOut"];

let server: Awaited<ReturnType<typeof startTestServer>>;
let clients: Record<Caller, Client>;
let mechanismId: string;

async function createShared(owner: Client, title: string) {
  const response = await owner.json("/api/v1/mechanisms", "POST", { title, source: "A + B -> C @ 1\n" });
  const { id } = await response.json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: (clients.editor as Client & { email: string }).email, role: "editor" });
  await owner.post(`/m/${id}/members`, { intent: "add", email: (clients.viewer as Client & { email: string }).email, role: "viewer" });
  return id as string;
}

beforeAll(async () => {
  server = await startTestServer();
  clients = {
    owner: await signUp(server.url, "Owner"),
    editor: await signUp(server.url, "Editor"),
    viewer: await signUp(server.url, "Viewer"),
    stranger: await signUp(server.url, "Stranger"),
    signedOut: new Client(server.url),
  };
  mechanismId = await createShared(clients.owner, "Walked mechanism");
});
afterAll(() => server?.dispose());

interface Check {
  name: string;
  call: (client: Client) => Promise<Response>;
  expected: Record<Caller, number>;
}

const page = { owner: 200, editor: 200, viewer: 200, stranger: 404, signedOut: 302 };
const api = { owner: 200, editor: 200, viewer: 200, stranger: 404, signedOut: 401 };

const checks: Check[] = [
  { name: "GET /dashboard", call: (c) => c.get("/dashboard"), expected: { owner: 200, editor: 200, viewer: 200, stranger: 200, signedOut: 302 } },
  { name: "GET /m/:id", call: (c) => c.get(`/m/${mechanismId}`), expected: page },
  { name: "GET /m/:id/members", call: (c) => c.get(`/m/${mechanismId}/members`), expected: page },
  {
    name: "POST /m/:id rename",
    call: (c) => c.post(`/m/${mechanismId}`, { intent: "rename", title: "Walked mechanism" }),
    expected: { owner: 200, editor: 200, viewer: 403, stranger: 404, signedOut: 302 },
  },
  {
    name: "POST /m/:id/members add",
    call: (c) => c.post(`/m/${mechanismId}/members`, { intent: "add", email: "nobody@example.test", role: "viewer" }),
    expected: { owner: 400, editor: 403, viewer: 403, stranger: 404, signedOut: 302 },
  },
  { name: "GET /m/:id/history", call: (c) => c.get(`/m/${mechanismId}/history`), expected: page },
  { name: "GET /m/:id/projector", call: (c) => c.get(`/m/${mechanismId}/projector`), expected: page },
  { name: "GET /api/v1/mechanisms/:id/snapshots", call: (c) => c.get(`/api/v1/mechanisms/${mechanismId}/snapshots`), expected: api },
  {
    name: "POST /api/v1/mechanisms/:id/snapshots",
    call: (c) => c.json(`/api/v1/mechanisms/${mechanismId}/snapshots`, "POST", { name: "checkpoint" }),
    expected: { owner: 201, editor: 201, viewer: 403, stranger: 404, signedOut: 401 },
  },
  {
    name: "PUT /api/v1/mechanisms/:id/source",
    call: (c) => c.json(`/api/v1/mechanisms/${mechanismId}/source`, "PUT", { source: "A + B -> C @ 1\n" }),
    expected: { owner: 200, editor: 200, viewer: 403, stranger: 404, signedOut: 401 },
  },
  {
    name: "POST /api/v1/mechanisms/:id/simulations",
    call: (c) => c.json(`/api/v1/mechanisms/${mechanismId}/simulations`, "POST", { until: 1, samples: 3 }),
    expected: api,
  },
  { name: "GET /api/v1/mechanisms/:id/export", call: (c) => c.get(`/api/v1/mechanisms/${mechanismId}/export?format=csv`), expected: api },
  {
    name: "POST /api/v1/mechanisms/:id/invitations",
    call: (c) => c.json(`/api/v1/mechanisms/${mechanismId}/invitations`, "POST", { email: "walk@example.test", role: "viewer" }),
    expected: { owner: 201, editor: 403, viewer: 403, stranger: 404, signedOut: 401 },
  },
  {
    name: "POST /api/v1/mechanisms/:id/view-links",
    call: (c) => c.json(`/api/v1/mechanisms/${mechanismId}/view-links`, "POST", {}),
    expected: { owner: 201, editor: 403, viewer: 403, stranger: 404, signedOut: 401 },
  },
  {
    name: "DELETE /api/v1/mechanisms/:id/view-links/:linkId",
    call: (c) => c.request(`/api/v1/mechanisms/${mechanismId}/view-links/00000000-0000-0000-0000-000000000000`, { method: "DELETE" }),
    expected: { owner: 404, editor: 403, viewer: 403, stranger: 404, signedOut: 401 },
  },
  {
    name: "POST /api/v1/mechanisms/:id/dynamics",
    call: (c) => c.json(`/api/v1/mechanisms/${mechanismId}/dynamics`, "POST", { kind: "simulate", source: "A -> B @ 1\n[A]0 = 1\n", settings: { until: 1, samples: 3 } }),
    expected: api,
  },
  { name: "POST /api/v1/analyze", call: (c) => c.json("/api/v1/analyze", "POST", { source: "A -> B" }), expected: { owner: 200, editor: 200, viewer: 200, stranger: 200, signedOut: 401 } },
  {
    name: "POST /api/v1/realizations",
    call: (c) => c.json("/api/v1/realizations", "POST", { ode: "x' = -x" }),
    expected: { owner: 200, editor: 200, viewer: 200, stranger: 200, signedOut: 401 },
  },
  { name: "GET /realize", call: (c) => c.get("/realize"), expected: { owner: 200, editor: 200, viewer: 200, stranger: 200, signedOut: 302 } },
  { name: "GET /settings/tokens", call: (c) => c.get("/settings/tokens"), expected: { owner: 200, editor: 200, viewer: 200, stranger: 200, signedOut: 302 } },
  { name: "GET /api/v1/mechanisms", call: (c) => c.get("/api/v1/mechanisms"), expected: { owner: 200, editor: 200, viewer: 200, stranger: 200, signedOut: 401 } },
  { name: "GET /api/v1/mechanisms/:id", call: (c) => c.get(`/api/v1/mechanisms/${mechanismId}`), expected: api },
  {
    name: "POST /api/v1/mechanisms",
    call: (c) => c.json("/api/v1/mechanisms", "POST", { title: "Scratch" }),
    expected: { owner: 201, editor: 201, viewer: 201, stranger: 201, signedOut: 401 },
  },
];

describe("authorization walk", () => {
  for (const check of checks) {
    it(check.name, async () => {
      const got: Record<string, number> = {};
      for (const caller of callers) got[caller] = (await check.call(clients[caller])).status;
      expect(got).toEqual(check.expected);
    });
  }

  it("a viewer's rename changes nothing, and a stranger learns nothing", async () => {
    const before = await (await clients.owner.get(`/api/v1/mechanisms/${mechanismId}`)).json();
    const denied = await clients.viewer.post(`/m/${mechanismId}`, { intent: "rename", title: "Hijacked" });
    expect(denied.status).toBe(403);
    const after = await (await clients.owner.get(`/api/v1/mechanisms/${mechanismId}`)).json();
    expect(after.title).toBe(before.title);
    const hidden = await clients.stranger.get(`/api/v1/mechanisms/${mechanismId}`);
    const missing = await clients.stranger.get(`/api/v1/mechanisms/doesnotexist`);
    expect(hidden.status).toBe(missing.status);
    expect(await hidden.json()).toEqual(await missing.json());
  });

  it("only the owner deletes", async () => {
    const id = await createShared(clients.owner, "To be deleted");
    for (const caller of ["editor", "viewer"] as const) {
      expect((await clients[caller].post(`/m/${id}`, { intent: "delete" })).status).toBe(403);
    }
    expect((await clients.stranger.post(`/m/${id}`, { intent: "delete" })).status).toBe(404);
    expect((await clients.owner.post(`/m/${id}`, { intent: "delete" })).status).toBe(302);
    expect((await clients.owner.get(`/api/v1/mechanisms/${id}`)).status).toBe(404);
  });

  it("lists mechanisms with the caller's role", async () => {
    const { mechanisms } = await (await clients.viewer.get("/api/v1/mechanisms")).json();
    expect(mechanisms.find((m: { id: string }) => m.id === mechanismId)).toMatchObject({ role: "viewer", title: "Walked mechanism", owner: "Owner" });
  });

  it("gives the API's error shape for bad input", async () => {
    const empty = await clients.owner.json("/api/v1/mechanisms", "POST", { title: "" });
    expect(empty.status).toBe(400);
    expect(await empty.json()).toEqual({ error: expect.stringContaining("title"), code: "bad_input" });
    const broken = await clients.owner.request("/api/v1/mechanisms", { method: "POST", headers: { "Content-Type": "application/json" }, body: "{" });
    expect(broken.status).toBe(400);
    const unknown = await clients.owner.get("/api/v1/nothing-here");
    expect(unknown.status).toBe(404);
    expect(await unknown.json()).toHaveProperty("error");
  });
});
