// A job that holds a worker for a minute or more, streamed (application/x-ndjson) so a test can
// read its first line — its place in the queue, or its first progress — and cancel it by aborting.
import { readFileSync } from "node:fs";
import { expect } from "vitest";
import { signUp, type Client } from "./http";

// Lotka–Volterra cycles at a tight tolerance, 200 times over.
export const oscillator = "X -> 2X @ 1\nX + Y -> 2Y @ 1\nY -> 0 @ 1\n[X]0 = 1\n[Y]0 = 0.5\n";
const options = { until: 1e4, rtol: 1e-12, samples: 100, target: { kind: "rate", reaction: 0 }, from: 0.5, to: 2, points: 200, scale: "linear", species: "X", observable: "max" };
export const longSweep = { kind: "sweep", source: oscillator, options };

/** POSTs the long sweep to a mechanism's dynamics route, asking for progress lines. */
export function streamLongSweep(client: Client, path: string, signal: AbortSignal): Promise<Response> {
  return client.request(path, {
    method: "POST",
    headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
    body: JSON.stringify(longSweep),
    signal,
  });
}

/** Every line of a streamed answer, parsed, until it ends. */
export async function* lines(response: Response): AsyncGenerator<unknown> {
  const reader = response.body!.pipeThrough(new TextDecoderStream()).getReader();
  let buffer = "";
  for (;;) {
    for (let end = buffer.indexOf("\n"); end >= 0; end = buffer.indexOf("\n")) {
      yield JSON.parse(buffer.slice(0, end));
      buffer = buffer.slice(end + 1);
    }
    const { value, done } = await reader.read();
    if (done) return;
    buffer += value;
  }
}

export async function firstLine(response: Response): Promise<unknown> {
  for await (const line of lines(response)) return line;
  throw new Error("the answer ended without a line");
}

/** The first line that is not a place in line: a job taken at once may still be seen waiting for a moment on a busy machine. */
export async function firstLineAfterWaiting(response: Response): Promise<unknown> {
  for await (const line of lines(response)) if ((line as { queued?: unknown }).queued === undefined) return line;
  throw new Error("the answer ended while waiting");
}

/**
 * One user's long job runs, three more wait with their places, a fifth is refused with 429, and
 * another user's quick job still goes through; every long job is cancelled at the end. Given more
 * than one app instance, the user's requests go round them in turn: the limits are the same.
 */
export async function expectFairShare(...serverUrls: string[]): Promise<void> {
  const lorenz = readFileSync(new URL("../fixtures/ode/lorenz.ode", import.meta.url), "utf8");
  const busy = await signUp(serverUrls[0], "Busy Chemist");
  const other = await signUp(serverUrls[0], "Other Chemist");
  const { id } = await (await busy.json("/api/v1/mechanisms", "POST", { title: "Oscillator", source: oscillator })).json();
  const path = `/api/v1/mechanisms/${id}/dynamics`;
  const busyAt = (request: number) => busy.at(serverUrls[request % serverUrls.length]);
  const cancel = new AbortController();
  try {
    const running = await streamLongSweep(busyAt(0), path, cancel.signal);
    expect(running.status).toBe(200);
    expect(await firstLineAfterWaiting(running)).toEqual({ progress: expect.any(Number) });
    for (const place of [1, 2, 3]) {
      const queued = await streamLongSweep(busyAt(place), path, cancel.signal);
      expect(await firstLine(queued)).toEqual({ queued: place });
    }
    for (const url of serverUrls) {
      const refused = await busy.at(url).json(path, "POST", longSweep);
      expect(refused.status).toBe(429);
      expect(Number(refused.headers.get("Retry-After"))).toBeGreaterThan(0);
      expect(await refused.json()).toEqual({ error: expect.stringMatching(/3 jobs waiting/), code: "busy" });
    }
    // The busy user's waiting jobs do not hold up somebody else's.
    const quick = await other.json("/api/v1/simulations", "POST", { ode: lorenz, settings: { until: 1, samples: 10 } });
    expect(quick.status).toBe(200);
  } finally {
    cancel.abort();
  }
}
