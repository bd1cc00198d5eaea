import { describe, expect, it } from "vitest";
import { FLAG_IDLE_AFTER_MS, PeerActivity } from "./peer-activity";

const carets = (entries: [number, string][]) => new Map(entries);

describe("a co-author's name flag", () => {
  it("shows from the caret's first appearance until it has stood still for the idle time", () => {
    const activity = new PeerActivity();
    activity.see(carets([[7, "a@3"]]), 1000);
    expect(activity.isActive(7, 1000)).toBe(true);
    expect(activity.isActive(7, 1000 + FLAG_IDLE_AFTER_MS - 1)).toBe(true);
    expect(activity.isActive(7, 1000 + FLAG_IDLE_AFTER_MS)).toBe(false);
  });

  it("comes back when the caret moves, and a renewal of the same caret does not count", () => {
    const activity = new PeerActivity(4000);
    activity.see(carets([[7, "a@3"]]), 0);
    activity.see(carets([[7, "a@3"]]), 3000);
    expect(activity.isActive(7, 4500)).toBe(false);
    activity.see(carets([[7, "a@4"]]), 9000);
    expect(activity.isActive(7, 9000)).toBe(true);
    expect(activity.isActive(7, 12_999)).toBe(true);
    expect(activity.isActive(7, 13_000)).toBe(false);
  });

  it("keeps each peer's clock apart and forgets those who left", () => {
    const activity = new PeerActivity(4000);
    activity.see(carets([[1, "x"], [2, "y"]]), 0);
    activity.see(carets([[1, "x"], [2, "y2"]]), 3000);
    expect(activity.isActive(1, 5000)).toBe(false);
    expect(activity.isActive(2, 5000)).toBe(true);
    activity.see(carets([[1, "x"]]), 5000);
    expect(activity.isActive(2, 5000)).toBe(false);
    // A returning peer is new, so their flag shows again.
    activity.see(carets([[1, "x"], [2, "y2"]]), 6000);
    expect(activity.isActive(2, 6000)).toBe(true);
  });

  it("says when the next shown flag fades, and nothing when none is shown", () => {
    const activity = new PeerActivity(4000);
    expect(activity.nextIdleIn(0)).toBeNull();
    activity.see(carets([[1, "x"], [2, "y"]]), 0);
    activity.see(carets([[1, "x"], [2, "y2"]]), 1500);
    expect(activity.nextIdleIn(2000)).toBe(2000);
    expect(activity.nextIdleIn(4000)).toBe(1500);
    expect(activity.nextIdleIn(5500)).toBeNull();
  });
});
