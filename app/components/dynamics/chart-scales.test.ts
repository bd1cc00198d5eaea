import { describe, expect, it } from "vitest";
import { linearRange, linearTicks, logRange, logTickLabels, logTicks, spansDecades } from "./chart-scales";

describe("chart scales", () => {
  it("draws integration noise on a flat curve flat: at least 5% of the magnitude is shown", () => {
    const range = linearRange(1.0000001, 1.0000003);
    expect(range.max - range.min).toBeGreaterThan(0.05);
    expect(range.min).toBeLessThan(1.0000001);
    expect(range.max).toBeGreaterThan(1.0000003);
  });

  it("keeps a real spread and a zero floor for values that are never negative", () => {
    expect(linearRange(0, 2e-6)).toEqual({ min: 0, max: expect.closeTo(2.08e-6, 12) });
    expect(linearRange(-1, 1).min).toBeLessThan(-1);
    expect(linearRange(0, 0)).toEqual({ min: 0, max: 1 });
  });

  it("puts linear ticks at 1, 2, 5 × 10^n and log ticks at powers of ten", () => {
    expect(linearTicks({ min: 0, max: 1e-3 })).toEqual([0, 0.0002, 0.0004, 0.0006, 0.0008, 0.001]);
    expect(linearTicks({ min: 0, max: 2.08e-6 })).toEqual([0, 5e-7, 1e-6, 1.5e-6, 2e-6]);
    expect(logRange(3e-9, 2e-6)).toEqual({ min: 1e-9, max: 1e-5 });
    expect(logRange(5e-324, 2e-6)).toEqual({ min: 1e-17, max: 1e-5 });
    expect(logRange(1e-6, 1e-6)).toEqual({ min: 1e-7, max: 1e-5 });
    expect(logTicks({ min: 1e-9, max: 1e-5 })).toEqual([1e-9, 1e-8, 1e-7, 1e-6, 1e-5]);
    expect(logTicks({ min: 1e-20, max: 1 })).toEqual([1e-20, 1e-17, 1e-14, 1e-11, 1e-8, 1e-5, 1e-2]);
  });

  it("labels only the decades of a log axis that spans several", () => {
    expect(logTickLabels([1e-8, 2e-8, 5e-8, 1e-7])).toEqual(["10⁻⁸", "", "", "10⁻⁷"]);
    expect(logTickLabels([2e-8, 5e-8])).toEqual(["2×10⁻⁸", "5×10⁻⁸"]);
  });

  it("calls for a log axis when positive values lie two decades apart or more", () => {
    expect(spansDecades(0.5, 50)).toBe(true);
    expect(spansDecades(5, 7)).toBe(false);
    expect(spansDecades(0, 50)).toBe(false);
  });
});
