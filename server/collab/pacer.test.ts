import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { Pacer } from "./pacer";

describe("Pacer", () => {
  beforeEach(() => vi.useFakeTimers({ toFake: ["setTimeout", "clearTimeout", "performance"] }));
  afterEach(() => vi.useRealTimers());

  it("runs the first request at once and gathers the next ones until the interval ends", () => {
    const run = vi.fn();
    const pacer = new Pacer(20, run);
    pacer.request();
    expect(run).toHaveBeenCalledTimes(1);
    vi.advanceTimersByTime(5);
    pacer.request();
    pacer.request();
    expect(run).toHaveBeenCalledTimes(1);
    vi.advanceTimersByTime(14);
    expect(run).toHaveBeenCalledTimes(1);
    vi.advanceTimersByTime(1);
    expect(run).toHaveBeenCalledTimes(2);
  });

  it("runs at once again after a quiet interval", () => {
    const run = vi.fn();
    const pacer = new Pacer(20, run);
    pacer.request();
    vi.advanceTimersByTime(50);
    pacer.request();
    expect(run).toHaveBeenCalledTimes(2);
  });

  it("runs nothing after dispose", () => {
    const run = vi.fn();
    const pacer = new Pacer(20, run);
    pacer.request();
    pacer.request();
    pacer.dispose();
    vi.advanceTimersByTime(100);
    expect(run).toHaveBeenCalledTimes(1);
  });
});
