// Settings from the environment reach the running server (server/env.ts → server/main.ts → the
// modules): one server started with small limits.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sessionCookie } from "../../server/auth/sessions";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
const newSecret = "new-secret-0123456789";
const oldSecret = "old-secret-0123456789";

beforeAll(async () => {
  server = await startTestServer({ API_REQUESTS_PER_MINUTE: "3", SIGN_IN_FREE_FAILURES: "1", SESSION_SECRET: `${newSecret},${oldSecret}` });
});
afterAll(() => server?.dispose());

describe("configuration from the environment", () => {
  it("limits each API token to API_REQUESTS_PER_MINUTE", async () => {
    const owner = await signUp(server.url, "Rita Rate");
    const { token } = await (await owner.json("/api/v1/tokens", "POST", { name: "script" })).json();
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await fetch(`${server.url}/api/v1/mechanisms`, { headers: { Authorization: `Bearer ${token}` } })).status);
    expect(statuses).toEqual([200, 200, 200, 429]);
  });

  it("makes a sign-in wait after SIGN_IN_FREE_FAILURES failures, and signs sessions with SESSION_SECRET's first secret", async () => {
    const owner = await signUp(server.url, "Sam Slow");
    const attempt = (password: string) => new Client(server.url).post("/sign-in", { email: owner.email, password });
    expect((await attempt("wrong")).status).toBe(401);
    const waiting = await attempt("wrong again");
    expect(waiting.status).toBe(429);
    expect(Number(waiting.headers.get("Retry-After"))).toBeGreaterThan(0);
    // The session cookie is signed with the first secret of the list.
    expect((await owner.get("/api/v1/mechanisms")).status).toBe(200);
    expect(await sessionCookie([newSecret], false).parse(owner.cookieHeader)).toEqual(expect.any(String));
    expect(await sessionCookie([oldSecret], false).parse(owner.cookieHeader)).toBeNull();
  });
});
