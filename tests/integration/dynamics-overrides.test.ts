// The Dynamics API on a real server: overrides of parameters and initial values, and sweeps of a
// temperature in expression coefficients, a held species and a labelled step.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let chemist: Awaited<ReturnType<typeof signUp>>;
let path: string;

const source = ["r1: A -> B @ 1e3 * exp(-3000 / T)", "r2: B + F -> C @ 2", "T = 500", "fixed [F] = 1", "[A]0 = 1"].join("\n");
const settings = { until: 0.1, samples: 2 };
const sweepOptions = { ...settings, from: 1, to: 2, points: 2, scale: "linear", species: "C", observable: "final" };

beforeAll(async () => {
  server = await startTestServer();
  chemist = await signUp(server.url, "Override Chemist");
  const { id } = await (await chemist.json("/api/v1/mechanisms", "POST", { title: "Hot scheme", source })).json();
  path = `/api/v1/mechanisms/${id}/dynamics`;
}, 60_000);
afterAll(() => server?.dispose());

async function run(body: object) {
  const response = await chemist.json(path, "POST", body);
  return { status: response.status, body: await response.json() };
}

describe("dynamics with overrides", { timeout: 120_000 }, () => {
  it("a simulation uses the overridden temperature and initial value", async () => {
    const plain = await run({ kind: "simulate", source, settings });
    const hot = await run({ kind: "simulate", source, overrides: { parameters: { T: 700 }, initial: { A: 2 } }, settings });
    expect([plain.status, hot.status]).toEqual([200, 200]);
    // A(t) = A0·exp(−k(T)·t) with k(T) = 1e3·exp(−3000/T).
    expect(plain.body.series.A[1]).toBeCloseTo(Math.exp(-1e3 * Math.exp(-6) * 0.1), 5);
    expect(hot.body.series.A[1]).toBeCloseTo(2 * Math.exp(-1e3 * Math.exp(-3000 / 700) * 0.1), 5);
  });

  it("an override naming nothing in the text is refused with a message", async () => {
    const refused = await run({ kind: "simulate", source, overrides: { parameters: { Tk: 700 } }, settings });
    expect(refused.status).toBeGreaterThanOrEqual(400);
    expect(refused.status).toBeLessThan(500);
    expect(refused.body.error).toMatch(/Tk names no parameter or species/);
  });

  it("sweeps a temperature, a held species and a labelled step", async () => {
    for (const target of [{ kind: "parameter", name: "T" }, { kind: "fixed", species: "F" }, { kind: "step", label: "r2" }]) {
      const swept = await run({ kind: "sweep", source, options: { ...sweepOptions, target, from: target.kind === "parameter" ? 500 : 1, to: target.kind === "parameter" ? 700 : 2 } });
      expect(swept.status).toBe(200);
      expect(swept.body.observed).toHaveLength(2);
      // More heat, more F or a faster r2: more C by the end.
      expect(swept.body.observed[1]).toBeGreaterThan(swept.body.observed[0]);
    }
  });
});
