import { describe, expect, it } from "vitest";
import { gcd, lcm, smallGcd } from "./integers";
import * as Q from "./rational";
import { independentRows, reducedNullSpace, solveLinear } from "./rational-matrix";

const q = (...values: number[]) => values.map((v) => Q.rational(v));
const text = (rows: Q.Rational[][]) => rows.map((row) => row.map(Q.toText));

describe("rational solving (hand-worked)", () => {
  it("solves a consistent singular system with the free unknown at 0, and refuses an inconsistent one", () => {
    // x + 2y = 3 twice over: y is free, so x = 3.
    expect(solveLinear([q(1, 2), q(2, 4)], q(3, 6))!.map(Q.toText)).toEqual(["3", "0"]);
    expect(solveLinear([q(1, 2), q(2, 4)], q(3, 7))).toBeNull();
  });

  it("solves with fractions exactly", () => {
    // x/2 + y/3 = 1, x − y = 1/6: substituting x = y + 1/6 gives 5y/6 = 11/12, so y = 11/10, x = 19/15.
    const half = Q.rational(1, 2);
    const third = Q.rational(1, 3);
    expect(solveLinear([[half, third], q(1, -1)], [Q.ONE, Q.rational(1, 6)])!.map(Q.toText)).toEqual(["19/15", "11/10"]);
  });

  it("takes pivots from the left, as Gauss–Jordan does: only the later unknowns are free", () => {
    // x + y + z = 1 and y + 2z = 1: pivots x, y; z = 0 gives y = 1, x = 0.
    expect(solveLinear([q(1, 1, 1), q(0, 1, 2)], q(1, 1))!.map(Q.toText)).toEqual(["0", "1", "0"]);
  });

  it("handles the empty system", () => {
    expect(solveLinear([], [])).toEqual([]);
  });
});

describe("reduced null space (hand-worked)", () => {
  it("gives Michaelis–Menten's laws led by their highest species: E + C and −E + S + P", () => {
    // Species E, S, C, P; reaction vectors of E + S → C and C → E + P.
    const { basis, leading } = reducedNullSpace([q(-1, -1, 1, 0), q(1, 0, -1, 1)], 4);
    expect(text(basis)).toEqual([["1", "0", "1", "0"], ["-1", "1", "0", "1"]]);
    expect(leading).toEqual([2, 3]);
  });

  it("finds the law among thirds, which the doubles of 1/3 only approximate: 3x + y", () => {
    // Changes (1/3, −1) and (−1, 3) over x, y are parallel; w = (3, 1) annihilates both and leads with 1 at y.
    const { basis, leading } = reducedNullSpace([[Q.rational(1, 3), Q.rational(-1)], q(-1, 3)], 2);
    expect(text(basis)).toEqual([["3", "1"]]);
    expect(leading).toEqual([1]);
  });

  it("is every unit vector when there are no rows", () => {
    expect(text(reducedNullSpace([], 2).basis)).toEqual([["1", "0"], ["0", "1"]]);
  });
});

describe("independent rows", () => {
  it("keeps each row that is not a combination of the rows before it", () => {
    expect(independentRows([q(0, 0, 0), q(1, 2, 0), q(2, 4, 0), q(0, 1, 1), q(1, 3, 1), q(0, 0, 5)])).toEqual([1, 3, 5]);
  });
});

describe("integers and rationals", () => {
  it("has one gcd, non-negative for any signs", () => {
    expect(gcd(-12n, 18n)).toBe(6n);
    expect(gcd(0n, -7n)).toBe(7n);
    expect(gcd(0n, 0n)).toBe(0n);
    expect(lcm(-4n, 6n)).toBe(12n);
    expect(smallGcd(-12, 18)).toBe(6);
  });

  it("reads a double back as the simplest fraction that rounds to it", () => {
    const read = (value: number) => Q.toText(Q.simplestRational(value));
    expect([1 / 3, -8 / 3, 0.1, 2.667, 42, -0].map(read)).toEqual(["1/3", "-8/3", "1/10", "2667/1000", "42", "0"]);
    for (const value of [Math.PI, 1e-20, 123456.789, 2 ** -40, 1e300]) expect(Q.toNumber(Q.simplestRational(value))).toBe(value);
  });
});
