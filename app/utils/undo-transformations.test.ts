import { describe, expect, it } from "vitest";
import { undoTransformations } from "./undo-transformations";

describe("undoTransformations", () => {
  it("subtracts the shift and rebuilds the original clock from the multiplier", () => {
    // y' = M(y) f with M = y (one variable): with y = 2 constant, τ runs at half the speed of t.
    const course = { t: [0, 1, 2], series: { y: [2, 2, 2] } };
    const back = undoTransformations(course, ["y"], [
      { kind: "translation", shift: { y: 1.5 } },
      { kind: "multiplication", monomial: "y" },
    ]);
    expect(back.series.y).toEqual([0.5, 0.5, 0.5]);
    expect(back.t).toEqual([0, 2, 4]);
  });

  it("leaves an untransformed course alone", () => {
    const course = { t: [0, 1], series: { x: [1, 2] } };
    expect(undoTransformations(course, ["x"], [])).toEqual(course);
  });
});
