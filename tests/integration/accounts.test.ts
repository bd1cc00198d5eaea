import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server?.dispose());

describe("accounts", () => {
  it("answers the health check with the database up", async () => {
    const response = await fetch(`${server.url}/healthz`);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ ok: true, db: "up" });
  });

  it("signs up, keeps the session in an httpOnly SameSite cookie, and signs out", async () => {
    const client = new Client(server.url);
    const response = await client.post("/sign-up", { name: "Ada Rivers", email: "ada.rivers@example.test", password: "long enough password" });
    expect(response.status).toBe(302);
    expect(response.headers.get("Location")).toBe("/dashboard");
    const cookie = response.headers.getSetCookie().join(";");
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect((await client.get("/dashboard")).status).toBe(200);
    expect((await client.post("/sign-out", {})).status).toBe(302);
    expect((await client.get("/dashboard")).status).toBe(302);
  });

  it("refuses a second account on the same address and a short password", async () => {
    await signUp(server.url, "First Owner");
    const client = new Client(server.url);
    const short = await client.post("/sign-up", { name: "Short", email: "short@example.test", password: "abc" });
    expect(short.status).toBe(400);
    expect(await short.text()).toContain("at least 10 characters");
    await client.post("/sign-up", { name: "Dup", email: "dup@example.test", password: "long enough password" });
    const again = await new Client(server.url).post("/sign-up", { name: "Dup", email: "DUP@example.test", password: "long enough password" });
    expect(again.status).toBe(400);
    expect(await again.text()).toContain("already exists");
  });

  it("signs in with the right password only, and limits failures per account", async () => {
    await new Client(server.url).post("/sign-up", { name: "Lim", email: "limited@example.test", password: "the right password" });
    const client = new Client(server.url);
    const ok = await client.post("/sign-in", { email: "limited@example.test", password: "the right password" });
    expect(ok.status).toBe(302);
    const wrong = await new Client(server.url).post("/sign-in", { email: "limited@example.test", password: "wrong" });
    expect(wrong.status).toBe(401);
    for (let i = 0; i < 8; i++) await new Client(server.url).post("/sign-in", { email: "limited@example.test", password: `wrong ${i}` });
    const blocked = await new Client(server.url).post("/sign-in", { email: "limited@example.test", password: "the right password" });
    expect(blocked.status).toBe(429);
  });

  it("does not follow a sign-in redirect off the site", async () => {
    await new Client(server.url).post("/sign-up", { name: "Nav", email: "nav@example.test", password: "the right password" });
    const response = await new Client(server.url).post("/sign-in?next=//evil.example", { email: "nav@example.test", password: "the right password" });
    expect(response.headers.get("Location")).toBe("/dashboard");
  });
});
