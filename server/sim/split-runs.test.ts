import { describe, expect, it } from "vitest";
import { splitRuns } from "./queued-jobs";

describe("splitRuns", () => {
  it("covers every run once, in order, in ranges whose sizes differ by at most one", () => {
    for (const [runs, parts] of [[1, 4], [3, 4], [41, 2], [10_000, 3], [7, 7]]) {
      const ranges = splitRuns(runs, parts);
      expect(ranges).toHaveLength(Math.min(runs, parts));
      expect(ranges.map((r) => r.first)).toEqual(ranges.map((_, i) => ranges.slice(0, i).reduce((sum, r) => sum + r.runs, 0)));
      expect(ranges.reduce((sum, r) => sum + r.runs, 0)).toBe(runs);
      const sizes = ranges.map((r) => r.runs);
      expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    }
  });
});
