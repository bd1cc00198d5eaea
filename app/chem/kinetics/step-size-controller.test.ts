import { describe, expect, it } from "vitest";
import { dormandPrince54 } from "./dormand-prince";
import { rodas4 } from "./rodas4";
import { StepSizeController } from "./step-size-controller";

describe("step-size controller", () => {
  it("cuts a step whose error is not a number to a fifth, and then does not grow", () => {
    const controller = new StepSizeController(rodas4.controller);
    expect(controller.next(1, Number.POSITIVE_INFINITY, false)).toBe(0.2);
    expect(controller.next(0.2, 1e-8, true)).toBe(0.2);
  });

  it("shrinks a rejected step by (err)^α / safety, at most by the shrink limit", () => {
    const controller = new StepSizeController(rodas4.controller);
    expect(controller.next(1, 16, false)).toBeCloseTo(0.9 / 2, 15);
    expect(controller.next(1, 1e12, false)).toBe(1 / 5);
  });

  it("grows an accepted step at most by the growth limit, with PI memory for Dormand–Prince", () => {
    const explicit = new StepSizeController(dormandPrince54.controller);
    expect(explicit.next(1, 1e-20, true)).toBeCloseTo(10, 12);
    // α = 0.17, β = 0.04, remembered error 1e-4 at first: 0.9 · 0.01^(−0.17) · 1e-4^0.04.
    const fresh = new StepSizeController(dormandPrince54.controller);
    expect(fresh.next(1, 0.01, true)).toBeCloseTo(0.9 * 0.01 ** -0.17 * 1e-4 ** 0.04, 12);
    expect(new StepSizeController(rodas4.controller).next(1, 1e-20, true)).toBeCloseTo(6, 12);
  });

  it("lets the predictive controller hold back growth when the error rises from step to step", () => {
    const controller = new StepSizeController(rodas4.controller);
    const first = controller.next(1, 0.01, true);
    const elementary = 0.9 * 0.9 ** -0.25;
    const predicted = 0.9 * (first / 1) * (0.9 ** 2 / 0.01) ** -0.25;
    expect(controller.next(first, 0.9, true)).toBeCloseTo(first * Math.min(elementary, predicted), 12);
    expect(predicted).toBeLessThan(elementary);
  });
});
