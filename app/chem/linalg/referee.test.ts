// The exact linear algebra against an independent library: mathjs in exact fraction arithmetic
// (determinants of minors for the rank, LU solving for square systems) on random small matrices.
import fc from "fast-check";
import { all, create, type Fraction } from "mathjs";
import { describe, expect, it } from "vitest";
import { nullSpace, rank } from "./kernel";
import * as Q from "./rational";
import type { Rational } from "./rational";
import { independentRows, reducedNullSpace, solveLinear } from "./rational-matrix";
import { sparseFromDense } from "./sparse";

const math = create(all, { number: "Fraction" });

const fraction = (value: Rational): Fraction => math.fraction(`${value.num}/${value.den}`) as Fraction;
const fractionRows = (rows: readonly (readonly Rational[])[]) => rows.map((row) => row.map(fraction));
const same = (a: Fraction, b: Rational) => math.equal(a, fraction(b)) as boolean;

/** k-element subsets of 0..n−1. */
function subsets(n: number, k: number): number[][] {
  if (k === 0) return [[]];
  if (n < k) return [];
  return [...subsets(n - 1, k), ...subsets(n - 1, k - 1).map((subset) => [...subset, n - 1])];
}

/** The largest k with a non-zero k × k minor, each determinant computed by mathjs in fractions. */
function refereeRank(rows: readonly (readonly Rational[])[], width: number): number {
  const matrix = fractionRows(rows);
  for (let k = Math.min(rows.length, width); k > 0; k--) {
    for (const chosenRows of subsets(rows.length, k)) {
      for (const chosenColumns of subsets(width, k)) {
        const minor = chosenRows.map((i) => chosenColumns.map((j) => matrix[i][j]));
        if (!math.isZero(math.det(minor))) return k;
      }
    }
  }
  return 0;
}

/** row · x in fractions, by mathjs. */
const dot = (row: readonly Rational[], x: readonly Rational[]) => row.reduce((sum, value, j) => math.add(sum, math.multiply(fraction(value), fraction(x[j])) as Fraction), math.fraction(0) as Fraction);

const smallRational = fc
  .tuple(fc.integer({ min: -4, max: 4 }), fc.constantFrom(1, 1, 1, 2, 3, 6))
  .map(([num, den]) => Q.rational(num, den));

/** Rows with rank deficiency made common: some rows are combinations of the first two. */
const rationalMatrix = fc
  .tuple(fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 5 }))
  .chain(([height, width]) =>
    fc.tuple(
      fc.array(fc.array(smallRational, { minLength: width, maxLength: width }), { minLength: height, maxLength: height }),
      fc.array(fc.tuple(smallRational, smallRational, fc.boolean()), { minLength: height, maxLength: height }),
    ).map(([rows, mix]) => {
      const result = rows.map((row) => row.slice());
      for (let i = 2; i < height; i++) {
        const [a, b, replace] = mix[i];
        if (replace) result[i] = result[0].map((value, j) => Q.add(Q.mul(a, value), Q.mul(b, result[1][j])));
      }
      return { rows: result, width };
    }),
  );

const integerMatrix = fc
  .tuple(fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 5 }))
  .chain(([height, width]) =>
    fc.array(fc.array(fc.integer({ min: -3, max: 3 }), { minLength: width, maxLength: width }), { minLength: height, maxLength: height }).map((rows) => {
      // A repeated or summed row now and then, for rank deficiency.
      if (rows.length >= 3) rows[2] = rows[0].map((value, j) => value - 2 * rows[1][j]);
      return { rows, width };
    }),
  );

describe("against mathjs", () => {
  it("rank equals the referee's largest non-singular minor (integer kernels)", () => {
    fc.assert(
      fc.property(integerMatrix, ({ rows, width }) => {
        const exact = rows.map((row) => row.map((value) => Q.rational(value)));
        expect(rank(rows.map(sparseFromDense))).toBe(refereeRank(exact, width));
      }),
      { numRuns: 200 },
    );
  });

  it("the integer null space is annihilated by every row and has dimension width − rank", () => {
    fc.assert(
      fc.property(integerMatrix, ({ rows, width }) => {
        const exact = rows.map((row) => row.map((value) => Q.rational(value)));
        const basis = nullSpace(rows.map(sparseFromDense), width).map((vector) => vector.map((value) => Q.rational(value)));
        expect(basis).toHaveLength(width - refereeRank(exact, width));
        for (const vector of basis) for (const row of exact) expect(math.isZero(dot(row, vector))).toBe(true);
        if (basis.length > 0) expect(refereeRank(basis, width)).toBe(basis.length);
      }),
      { numRuns: 150 },
    );
  });

  it("the left null space (conservation laws) of a rational matrix is reduced, led by 1 on its highest columns", () => {
    fc.assert(
      fc.property(rationalMatrix, ({ rows, width }) => {
        // Rows here are the columns of S, so the null space is S's left null space.
        const { basis, leading } = reducedNullSpace(rows, width);
        expect(basis).toHaveLength(width - refereeRank(rows, width));
        basis.forEach((vector, k) => {
          for (const row of rows) expect(math.isZero(dot(row, vector))).toBe(true);
          expect(Q.toText(vector[leading[k]])).toBe("1");
          vector.forEach((value, j) => j > leading[k] && expect(Q.isZero(value)).toBe(true));
          basis.forEach((other, l) => l !== k && expect(Q.isZero(other[leading[k]])).toBe(true));
        });
        if (basis.length > 0) expect(refereeRank(basis, width)).toBe(basis.length);
      }),
      { numRuns: 150 },
    );
  });

  it("a non-singular square system has mathjs's exact LU solution", () => {
    const square = fc.integer({ min: 1, max: 5 }).chain((n) =>
      fc.tuple(
        fc.array(fc.array(smallRational, { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
        fc.array(smallRational, { minLength: n, maxLength: n }),
      ),
    );
    let solved = 0;
    fc.assert(
      fc.property(square, ([a, b]) => {
        if (math.isZero(math.det(fractionRows(a)))) return;
        solved++;
        const expected = math.lusolve(fractionRows(a), b.map(fraction)) as unknown as Fraction[][];
        const x = solveLinear(a, b)!;
        x.forEach((value, i) => expect(same(expected[i][0], value)).toBe(true));
      }),
      { numRuns: 150 },
    );
    expect(solved).toBeGreaterThan(75);
  });

  it("any system is solved exactly when the referee says it is consistent (rank A = rank [A | b]), and refused otherwise", () => {
    const outcomes = { consistent: 0, inconsistent: 0 };
    fc.assert(
      fc.property(rationalMatrix, fc.array(smallRational, { minLength: 4, maxLength: 4 }), fc.boolean(), ({ rows, width }, free, reachable) => {
        // Half the time b = A·t for some t, so consistent singular systems are common.
        const b = reachable ? rows.map((row) => row.reduce((sum, value, j) => Q.add(sum, Q.mul(value, free[j % 4])), Q.ZERO)) : free.slice(0, rows.length);
        const consistent = refereeRank(rows, width) === refereeRank(rows.map((row, i) => [...row, b[i]]), width + 1);
        const x = solveLinear(rows, b);
        outcomes[consistent ? "consistent" : "inconsistent"]++;
        expect(x !== null).toBe(consistent);
        if (x) rows.forEach((row, i) => expect(same(dot(row, x), b[i])).toBe(true));
      }),
      { numRuns: 150 },
    );
    expect(outcomes.consistent).toBeGreaterThan(30);
    expect(outcomes.inconsistent).toBeGreaterThan(10);
  });

  it("independent rows are a basis of the row space, each independent of the rows before it", () => {
    fc.assert(
      fc.property(rationalMatrix, ({ rows, width }) => {
        const chosen = independentRows(rows);
        expect(chosen).toHaveLength(refereeRank(rows, width));
        chosen.forEach((index, k) => expect(refereeRank(rows.slice(0, index + 1), width)).toBe(k + 1));
      }),
      { numRuns: 150 },
    );
  });
});
