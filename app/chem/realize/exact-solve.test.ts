import { describe, expect, it } from "vitest";
import * as Q from "../ode/rational";
import { snapToExact, solveLinear } from "./exact-solve";

const q = (...values: number[]) => values.map((v) => Q.rational(v));

describe("exact linear solving", () => {
  it("solves a consistent singular system and refuses an inconsistent one", () => {
    expect(solveLinear([q(1, 2), q(2, 4)], q(3, 6))!.map(Q.toText)).toEqual(["3", "0"]);
    expect(solveLinear([q(1, 2), q(2, 4)], q(3, 7))).toBeNull();
  });

  it("snaps a rounded point onto the exact affine set", () => {
    // a·(1, 0) + b·(1, 1) = (1/3, 1/3) has the single solution a = 0, b = 1/3.
    const snapped = snapToExact([[1, 0], [1, 1]], [Q.rational(1, 3), Q.rational(1, 3)], [1e-13, 0.333333333333]);
    expect(snapped!.map(Q.toText)).toEqual(["0", "1/3"]);
  });
});
