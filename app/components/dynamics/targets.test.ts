import { describe, expect, it } from "vitest";
import { defaultSweepRange, sweepTargets, targetValues } from "./targets";

const source = [
  "T = 1100",
  "k2 = 3e-4",
  "fixed [B] = 2.5",
  "r1: A + B -> C @ 2.0e6 * T^0.5",
  "r2: C <=> D @ k2, 40",
  "[A]0 = 1e-3",
  "",
].join("\n");

describe("the value of each quantity a sweep can vary", () => {
  it("reads parameters, held species, initial values and labelled steps' coefficients, expressions included", () => {
    const values = targetValues(source);
    expect(values.get("parameter:T")).toBe(1100);
    expect(values.get("fixed:B")).toBe(2.5);
    expect(values.get("initial:A")).toBe(1e-3);
    expect(values.get("initial:D")).toBe(0);
    expect(values.get("step:r1")).toBeCloseTo(2e6 * Math.sqrt(1100), 6);
    expect(values.get("step:r2")).toBe(3e-4);
    expect(values.get("step:r2:backward")).toBe(40);
    // Every choice offered has a value to start from.
    for (const choice of sweepTargets(source, ["A", "C", "D"])) expect(values.has(choice), choice).toBe(true);
  });

  it("starts a decade either side of the value (a quarter for a temperature T), and at 0.5 … 5 when there is none to go by", () => {
    expect(defaultSweepRange(1100)).toEqual({ from: 110, to: 11000 });
    expect(defaultSweepRange(3e-4)).toEqual({ from: 3e-5, to: 3e-3 });
    expect(defaultSweepRange(0)).toEqual({ from: 0.5, to: 5 });
    expect(defaultSweepRange(1100, "parameter:T")).toEqual({ from: 825, to: 1375 });
    expect(defaultSweepRange(1100, "parameter:Ta")).toEqual({ from: 110, to: 11000 });
    expect(defaultSweepRange(undefined)).toEqual({ from: 0.5, to: 5 });
  });
});
