// Source: worked by hand. x' = -x, x(0) = 1 has x(t) = e^(-t); multiplied by x it is x' = -x², whose
// solution 1/(1 + s) reaches e^(-T) at s = e^T - 1 = ∫₀ᵀ dt / x(t).
import { describe, expect, it } from "vitest";
import { parseOde } from "./parse";
import { rescaledHorizon } from "./time-scale";

const exact = (text: string) => parseOde(text).exact!;

describe("the end time of a system multiplied by a monomial", () => {
  it("integrates dt / m along the trajectory: x' = -x times x reaches t = 2 at s = e² - 1", () => {
    const horizon = rescaledHorizon(exact("x' = -x\nx(0) = 1\n"), [1], 2);
    expect(horizon?.basis).toBe("trajectory");
    expect(horizon!.until).toBeCloseTo(Math.exp(2) - 1, 5);
  });

  it("falls back on the initial state when the trajectory leaves the orthant (x' = -1 crosses 0 at t = 1)", () => {
    expect(rescaledHorizon(exact("x' = -1\nx(0) = 2\n"), [1], 5)).toEqual({ until: 2.5, basis: "initial state" });
  });

  it("gives none when the multiplier is not positive at the start", () => {
    expect(rescaledHorizon(exact("x' = -1\nx(0) = 0\n"), [1], 5)).toBeNull();
  });
});
