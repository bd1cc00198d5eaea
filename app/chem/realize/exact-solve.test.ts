import { describe, expect, it } from "vitest";
import * as Q from "../linalg/rational";
import { snapToExact } from "./exact-solve";

describe("snapping onto the exact solutions", () => {
  it("snaps a rounded point onto the exact affine set", () => {
    // a·(1, 0) + b·(1, 1) = (1/3, 1/3) has the single solution a = 0, b = 1/3.
    const snapped = snapToExact([[1, 0], [1, 1]], [Q.rational(1, 3), Q.rational(1, 3)], [1e-13, 0.333333333333]);
    expect(snapped!.map(Q.toText)).toEqual(["0", "1/3"]);
  });
});
