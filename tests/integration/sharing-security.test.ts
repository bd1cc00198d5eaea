// Invitations, view links and access tokens: they work once, until expiry, until revoked.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, confirmAddress, linkIn, mailTo, signUp } from "../support/http";
import { query } from "../support/database";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let owner: Awaited<ReturnType<typeof signUp>>;
let mechanismId: string;

const sql = (text: string, values: unknown[] = []) => query(server.databaseUrl, text, values);

async function latestMailTo(address: string) {
  return (await mailTo(server.url, address))[0];
}

beforeAll(async () => {
  server = await startTestServer();
  owner = await signUp(server.url, "Grace Owner");
  ({ id: mechanismId } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Shared lecture" })).json());
});
afterAll(() => server?.dispose());

describe("invitations", () => {
  it("e-mails a single-use link that signs the invitee up; the role comes once the address is confirmed", async () => {
    const response = await owner.json(`/api/v1/mechanisms/${mechanismId}/invitations`, "POST", { email: "newcomer@example.test", role: "editor" });
    expect(response.status).toBe(201);
    const mail = await latestMailTo("newcomer@example.test");
    expect(mail?.subject).toContain("Shared lecture");
    const url = linkIn(mail!, "/invite/");

    const invitee = new Client(server.url);
    const page = await invitee.get(url.pathname);
    expect(page.status).toBe(200);
    const joined = await invitee.post(url.pathname, { intent: "sign-up", name: "New Comer", email: "newcomer@example.test", password: "a good long password" });
    expect(joined.status).toBe(302);
    expect(joined.headers.get("Location")).toBe("/verify-email");
    expect((await invitee.get(`/api/v1/mechanisms/${mechanismId}`)).status).toBe(404);
    expect(await (await invitee.get("/verify-email")).text()).toContain("Shared lecture");
    expect((await confirmAddress(server.url, "newcomer@example.test")).status).toBe(200);
    expect((await (await invitee.get(`/api/v1/mechanisms/${mechanismId}`)).json()).role).toBe("editor");

    const reused = await new Client(server.url).get(url.pathname);
    expect(reused.status).toBe(404);
    expect(await reused.text()).toContain("already used");
  });

  it("refuses revoked and expired invitations", async () => {
    await owner.json(`/api/v1/mechanisms/${mechanismId}/invitations`, "POST", { email: "late@example.test", role: "viewer" });
    const expiredUrl = linkIn((await latestMailTo("late@example.test"))!, "/invite/");
    await sql("update invitations set expires_at = now() - interval '1 minute' where email = 'late@example.test'");
    expect(await (await new Client(server.url).get(expiredUrl.pathname)).text()).toContain("expired");

    await owner.json(`/api/v1/mechanisms/${mechanismId}/invitations`, "POST", { email: "withdrawn@example.test", role: "viewer" });
    const revokedUrl = linkIn((await latestMailTo("withdrawn@example.test"))!, "/invite/");
    const { rows } = await sql("select id from invitations where email = 'withdrawn@example.test'");
    await owner.post(`/m/${mechanismId}/members`, { intent: "uninvite", invitationId: rows[0].id });
    const refused = await new Client(server.url).post(revokedUrl.pathname, { intent: "sign-up", name: "W", email: "withdrawn@example.test", password: "a good long password" });
    expect(refused.status).toBe(400);
    expect(await refused.text()).toContain("withdrawn");
  });

  it("only the owner invites", async () => {
    const stranger = await signUp(server.url, "Stranger");
    const response = await stranger.json(`/api/v1/mechanisms/${mechanismId}/invitations`, "POST", { email: "x@example.test", role: "editor" });
    expect(response.status).toBe(404);
  });
});

describe("view links", () => {
  it("grant viewer access to a signed-out browser until revoked", async () => {
    const created = await owner.json(`/api/v1/mechanisms/${mechanismId}/view-links`, "POST", {});
    expect(created.status).toBe(201);
    const { id, url } = await created.json();
    const visitor = new Client(server.url);
    expect((await visitor.get(`/m/${mechanismId}`)).status).toBe(302);
    const opened = await visitor.get(new URL(url).pathname);
    expect(opened.headers.get("Location")).toBe(`/m/${mechanismId}`);
    expect((await visitor.get(`/m/${mechanismId}`)).status).toBe(200);
    // Nothing else: not the members page, not the API.
    expect((await visitor.get(`/m/${mechanismId}/members`)).status).toBe(302);
    expect((await visitor.post(`/m/${mechanismId}`, { intent: "rename", title: "x" })).status).not.toBe(200);

    expect((await owner.request(`/api/v1/mechanisms/${mechanismId}/view-links/${id}`, { method: "DELETE" })).status).toBe(204);
    expect((await visitor.get(`/m/${mechanismId}`)).status).toBe(302);
    expect((await new Client(server.url).get(new URL(url).pathname)).status).toBe(404);
  });

  it("stop working after they expire", async () => {
    const soon = new Date(Date.now() + 60_000).toISOString();
    const { url } = await (await owner.json(`/api/v1/mechanisms/${mechanismId}/view-links`, "POST", { expiresAt: soon })).json();
    const visitor = new Client(server.url);
    await visitor.get(new URL(url).pathname);
    expect((await visitor.get(`/m/${mechanismId}`)).status).toBe(200);
    await sql("update view_links set expires_at = now() - interval '1 second' where expires_at is not null");
    expect((await visitor.get(`/m/${mechanismId}`)).status).toBe(302);
  });
});

describe("personal access tokens", () => {
  it("act with the owner's roles, never after revocation, and cannot mint tokens", async () => {
    const created = await owner.json("/api/v1/tokens", "POST", { name: "script" });
    expect(created.status).toBe(201);
    const { id, token } = await created.json();
    const bearer = { Authorization: `Bearer ${token}` };
    const list = await fetch(`${server.url}/api/v1/mechanisms`, { headers: bearer });
    expect(list.status).toBe(200);
    expect((await list.json()).mechanisms.some((m: { id: string }) => m.id === mechanismId)).toBe(true);
    const mint = await fetch(`${server.url}/api/v1/tokens`, { method: "POST", headers: { ...bearer, "Content-Type": "application/json" }, body: '{"name":"x"}' });
    expect(mint.status).toBe(403);

    expect((await owner.request(`/api/v1/tokens/${id}`, { method: "DELETE" })).status).toBe(204);
    const after = await fetch(`${server.url}/api/v1/mechanisms`, { headers: bearer });
    expect(after.status).toBe(401);
    expect(await after.json()).toEqual({ error: expect.stringContaining("revoked"), code: "sign_in_required" });
  });

  it("a viewer's token cannot change what a viewer cannot", async () => {
    const viewer = await signUp(server.url, "Token Viewer");
    await owner.post(`/m/${mechanismId}/members`, { intent: "add", email: viewer.email, role: "viewer" });
    const { token } = await (await viewer.json("/api/v1/tokens", "POST", { name: "viewer script" })).json();
    const headers = { Authorization: `Bearer ${token}`, "Content-Type": "application/json" };
    const read = await fetch(`${server.url}/api/v1/mechanisms/${mechanismId}`, { headers });
    expect(read.status).toBe(200);
    const invite = await fetch(`${server.url}/api/v1/mechanisms/${mechanismId}/invitations`, { method: "POST", headers, body: JSON.stringify({ email: "a@example.test", role: "editor" }) });
    expect(invite.status).toBe(403);
  });

  it("are rate limited per token", async () => {
    const { token } = await (await owner.json("/api/v1/tokens", "POST", { name: "busy script" })).json();
    const statuses: number[] = [];
    for (let i = 0; i < 125; i++) statuses.push((await fetch(`${server.url}/api/v1/mechanisms`, { headers: { Authorization: `Bearer ${token}` } })).status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(120);
    expect(statuses.at(-1)).toBe(429);
  });
});
