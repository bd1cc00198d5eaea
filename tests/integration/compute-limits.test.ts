// Nothing a user sends freezes the server: every analysis of user text runs in a worker under a
// time limit (HTTP and live rooms alike), and one user cannot hold every simulation worker.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eventually, joinRoom } from "../support/collab-client";
import { signUp } from "../support/http";
import { expectFairShare } from "../support/long-jobs";
import { startTestServer } from "../support/server";

const LIMIT_MS = 4_000;

let server: Awaited<ReturnType<typeof startTestServer>>;
let owner: Awaited<ReturnType<typeof signUp>>;

/**
 * 1,000 reversible steps between complexes of 20 of 5,000 species: the exact null space of its
 * reaction vectors (thousands of conservation laws, filled in densely) takes minutes on one core.
 */
function pathologicalText(): string {
  let seed = 1;
  const random = () => {
    seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
    return (seed >>> 8) / 2 ** 24;
  };
  const complex = () => {
    const picked = new Set<number>();
    while (picked.size < 20) picked.add(Math.floor(random() * 5000));
    return [...picked].map((i) => `${1 + Math.floor(random() * 3)} S${i}`).join(" + ");
  };
  return Array.from({ length: 1000 }, () => `${complex()} <=> ${complex()} @ 1, 2`).join("\n") + "\n";
}

/** Polls /healthz while `pending` is unsettled; returns the slowest answer's time in ms. */
async function slowestHealthCheck(pending: Promise<unknown>): Promise<number> {
  let settled = false;
  void pending.finally(() => (settled = true));
  let slowest = 0;
  let checks = 0;
  while (!settled || checks < 3) {
    const started = performance.now();
    const response = await fetch(`${server.url}/healthz`);
    expect(response.status).toBe(200);
    slowest = Math.max(slowest, performance.now() - started);
    checks++;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  return slowest;
}

beforeAll(async () => {
  server = await startTestServer({ ANALYSIS_TIME_LIMIT_MS: String(LIMIT_MS) });
  owner = await signUp(server.url, "Limits Owner");
  // Boots a worker, so the limit below measures analysis, not start-up.
  expect((await owner.json("/api/v1/analyze", "POST", { source: "A -> B @ 1\n" })).status).toBe(200);
}, 60_000);
afterAll(() => server?.dispose());

describe("analysis of user text under a time limit", { timeout: 120_000 }, () => {
  it("POST /api/v1/analyze of a pathological text answers 503 with { error } while /healthz stays quick", async () => {
    const pending = owner.json("/api/v1/analyze", "POST", { source: pathologicalText() });
    expect(await slowestHealthCheck(pending)).toBeLessThan(1_000);
    const response = await pending;
    expect(response.status).toBe(503);
    expect(await response.json()).toEqual({ error: `The analysis took longer than ${LIMIT_MS / 1000} s and was stopped.`, code: "time_limit" });
  });

  it("the mechanism API and the exports that analyse the text answer 503 too", async () => {
    const created = await owner.json("/api/v1/mechanisms", "POST", { title: "Too tangled", source: pathologicalText() });
    const { id } = await created.json();
    const mechanism = owner.get(`/api/v1/mechanisms/${id}`);
    expect(await slowestHealthCheck(mechanism)).toBeLessThan(1_000);
    expect((await mechanism).status).toBe(503);
    const latex = await owner.get(`/api/v1/mechanisms/${id}/export?format=latex`);
    expect(latex.status).toBe(503);
    expect(await latex.json()).toEqual({ error: expect.stringMatching(/longer than 4 s/), code: "time_limit" });
  });

  it("a live room shows why its text has no analysis, and analyses the next text as usual", async () => {
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Room", source: pathologicalText() })).json();
    const room = joinRoom(server.url, id, owner.cookieHeader);
    try {
      await eventually("the time-out message", () => typeof room.analysis.get("failure") === "string", 60_000);
      expect(room.analysis.get("failure")).toBe(`The analysis of this text took longer than ${LIMIT_MS / 1000} s and was stopped.`);
      room.doc.transact(() => {
        room.text.delete(0, room.text.length);
        room.text.insert(0, "A + B <=> C @ 1, 2\n");
      });
      await eventually("the analysis of the new text", () => room.analysis.get("species") === 3 && !room.analysis.has("failure"), 60_000);
    } finally {
      room.close();
    }
  });
});

describe("simulation workers shared fairly", { timeout: 120_000 }, () => {
  it("runs one job per user, queues three more with their places, refuses a fifth with 429, and lets others through", () => expectFairShare(server.url));
});
