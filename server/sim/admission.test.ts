import { describe, expect, it } from "vitest";
import { Admission, QueueFullError } from "./admission";

const cancelled = () => new Error("cancelled");

describe("job admission", () => {
  it("runs one job per owner at a time, starts others' jobs first, and reports places in the queue", async () => {
    const admission = new Admission({ concurrency: 2, running: 1, queued: 2 }, 7);
    const started: string[] = [];
    const positions: Record<string, number[]> = { a2: [], a3: [], b1: [] };
    const admit = (owner: string, name: string) =>
      admission.admit(owner, { onQueued: (p) => positions[name]?.push(p) }, cancelled).then((release) => {
        started.push(name);
        return release;
      });
    const a1 = await admit("a", "a1");
    const a2 = admit("a", "a2");
    const a3 = admit("a", "a3");
    // Another user's job overtakes the waiting ones of a user who is already running.
    const b1 = await admit("b", "b1");
    expect(started).toEqual(["a1", "b1"]);
    expect(positions).toEqual({ a2: [1], a3: [2], b1: [] });
    await expect(admission.admit("a", {}, cancelled)).rejects.toBeInstanceOf(QueueFullError);
    await expect(admission.admit("a", {}, cancelled)).rejects.toMatchObject({ retryAfter: 7 });
    b1();
    expect(started).toEqual(["a1", "b1"]);
    a1();
    (await a2)();
    (await a3)();
    expect(started).toEqual(["a1", "b1", "a2", "a3"]);
    expect(positions.a3).toEqual([2, 1]);
  });

  it("takes a cancelled job out of the queue and moves the others up", async () => {
    const admission = new Admission({ concurrency: 1, running: 1, queued: 3 }, 1);
    const release = await admission.admit("a", {}, cancelled);
    const controller = new AbortController();
    const first = admission.admit("b", { signal: controller.signal }, cancelled);
    const places: number[] = [];
    const second = admission.admit("c", { onQueued: (p) => places.push(p) }, cancelled);
    controller.abort();
    await expect(first).rejects.toThrow("cancelled");
    expect(places).toEqual([2, 1]);
    release();
    await second;
  });
});
