import { availableParallelism } from "node:os";
import { describe, expect, it } from "vitest";
import { WorkerBudget } from "./worker-budget";

describe("worker budget", () => {
  it("by default sizes both pools as they were sized apart: analysis threads cores−1 (1 to 4), jobs cores−1 (at least 2)", () => {
    const budget = new WorkerBudget();
    const cores = availableParallelism();
    expect(budget.analysisThreads).toBe(Math.max(1, Math.min(4, cores - 1)));
    expect(budget.jobsAtOnce).toBe(Math.max(2, cores - 1));
  });

  it("gives both pools their share of a configured size", () => {
    expect([1, 2, 4, 8].map((size) => new WorkerBudget(size)).map((b) => [b.analysisThreads, b.jobsAtOnce])).toEqual([
      [1, 2],
      [2, 2],
      [4, 4],
      [4, 8],
    ]);
  });

  it("refuses a size that is not a whole number of cores", () => {
    expect(() => new WorkerBudget(0)).toThrow(/at least one core/);
    expect(() => new WorkerBudget(1.5)).toThrow();
  });
});
