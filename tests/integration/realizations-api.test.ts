// ODE to mechanism through the API, run in a worker thread: the contract's fields, streamed
// progress for the equivalents search, and clear refusals.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let client: Awaited<ReturnType<typeof signUp>>;
beforeAll(async () => {
  server = await startTestServer();
  client = await signUp(server.url, "Ode Modeller");
});
afterAll(() => server?.dispose());

// Lotka–Volterra, the textbook kinetic example.
const lotkaVolterra = "x' = x - x*y\ny' = x*y - y\nx(0) = 2\ny(0) = 1\n";

describe("POST /api/v1/realizations", () => {
  it("gives the realize contract for a kinetic ODE", async () => {
    const response = await client.json("/api/v1/realizations", "POST", { ode: lotkaVolterra });
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.kinetic).toBe(true);
    expect(body.negativeCrossEffects).toEqual([]);
    expect(body.mechanism).toContain("->");
    expect(body.maxOrder).toBe(2);
  });

  it("names the negative cross effects of a non-kinetic ODE", async () => {
    const body = await (await client.json("/api/v1/realizations", "POST", { ode: "x' = -y\ny' = x\n" })).json();
    expect(body.kinetic).toBe(false);
    expect(body.negativeCrossEffects.map((e: { equation: string; term: string }) => e.equation)).toContain("x");
  });

  it("streams progress while searching equivalent realizations", async () => {
    const response = await client.request("/api/v1/realizations", {
      method: "POST",
      headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
      body: JSON.stringify({ ode: lotkaVolterra, equivalents: true, complexes: ["2y"] }),
    });
    const lines = (await response.text()).trim().split("\n").map((line) => JSON.parse(line));
    const { result } = lines.at(-1);
    expect(lines.some((l) => typeof l.progress === "number")).toBe(true);
    // The textbook scheme X → 2X, X + Y → 2Y, Y → 0 has three steps: the sparse minimum.
    expect(result.equivalents.sparse.reactions).toBe(3);
  });

  it("refuses a shift of an unknown variable and malformed bodies", async () => {
    const unknown = await client.json("/api/v1/realizations", "POST", { ode: lotkaVolterra, shift: { q: 1 } });
    expect(unknown.status).toBe(400);
    expect(await unknown.json()).toEqual({ error: expect.stringContaining("q"), code: "bad_input" });
    expect((await client.json("/api/v1/realizations", "POST", { shift: 3 })).status).toBe(400);
  });
});
