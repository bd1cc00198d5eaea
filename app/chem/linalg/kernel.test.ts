import fc from "fast-check";
import { eigs, multiply, transpose } from "mathjs";
import { describe, expect, it } from "vitest";
import { ExactSizeLimitError } from "./fraction-free";
import { nullSpace, rank } from "./kernel";
import type { SparseVector } from "./sparse";

function sparse(rows: number[][]): SparseVector[] {
  return rows.map((row) => {
    const indices = row.flatMap((value, index) => (value === 0 ? [] : [index]));
    return { indices, values: indices.map((index) => row[index]) };
  });
}

/** Floating rank from the eigenvalues of A·Aᵀ, or null when no clear gap separates zero from the rest. */
function floatingRank(rows: number[][]): number | null {
  if (rows.length === 0) return 0;
  const gram = multiply(rows, transpose(rows)) as number[][];
  const values = (eigs(gram).values as number[]).map((value) => Math.abs(value));
  if (values.some((value) => value > 1e-8 && value < 1e-3)) return null;
  return values.filter((value) => value >= 1e-3).length;
}

const matrix = fc
  .tuple(fc.integer({ min: 1, max: 6 }), fc.integer({ min: 1, max: 6 }))
  .chain(([height, width]) =>
    fc.tuple(
      fc.array(fc.array(fc.integer({ min: -3, max: 3 }), { minLength: width, maxLength: width }), { minLength: height, maxLength: height }),
      // Some rows are replaced by integer combinations of earlier ones, so rank-deficient cases are common.
      fc.array(fc.tuple(fc.integer({ min: -2, max: 2 }), fc.integer({ min: -2, max: 2 })), { minLength: height, maxLength: height }),
      fc.array(fc.boolean(), { minLength: height, maxLength: height }),
    ).map(([rows, mix, replace]) => {
      const result = rows.map((row) => row.slice());
      for (let i = 2; i < result.length; i++) {
        if (replace[i]) result[i] = result[0].map((value, j) => mix[i][0] * value + mix[i][1] * result[1][j]);
      }
      return { rows: result, width };
    }),
  );

describe("exact rank", () => {
  it("agrees with floating rank (mathjs eigenvalues) wherever that is unambiguous", () => {
    let compared = 0;
    fc.assert(
      fc.property(matrix, ({ rows }) => {
        const expected = floatingRank(rows);
        if (expected === null) return;
        compared++;
        expect(rank(sparse(rows))).toBe(expected);
      }),
      { numRuns: 400 },
    );
    expect(compared).toBeGreaterThan(300);
  });

  it("is at most min(rows, columns)", () => {
    fc.assert(fc.property(matrix, ({ rows, width }) => rank(sparse(rows)) <= Math.min(rows.length, width)));
  });

  it("stays exact where doubles would lose digits", () => {
    // Fraction-free elimination of these rows forms products near 10^16, beyond the 2^53 doubles hold exactly.
    const big = 10 ** 8;
    const rows = [
      [big, big + 1, 1],
      [big + 1, big + 2, 1],
      [big - 1, big, 1],
    ];
    expect(rank(sparse(rows))).toBe(2);
    expect(nullSpace(sparse(rows), 3)).toEqual([[1, -1, 1]]);
  });
});

describe("null space", () => {
  it("is a primitive integer basis of { x : A x = 0 } of dimension width − rank", () => {
    fc.assert(
      fc.property(matrix, ({ rows, width }) => {
        const basis = nullSpace(sparse(rows), width);
        expect(basis.length).toBe(width - rank(sparse(rows)));
        for (const vector of basis) {
          for (const row of rows) expect(row.reduce((sum, value, j) => sum + value * vector[j], 0)).toBe(0);
          expect(vector.reduce((g, value) => gcd(g, Math.abs(value)), 0)).toBe(1);
        }
        expect(rank(sparse(basis))).toBe(basis.length);
      }),
      { numRuns: 300 },
    );
  });

  it("falls back to bigint when the kernel holds fractions too large to lift from one prime", () => {
    expect(nullSpace(sparse([[1, -10007]]), 2)).toEqual([[10007, 1]]);
    expect(nullSpace(sparse([[3, 0, -7_000_001], [0, 5, -7_000_001]]), 3)).toEqual([[35_000_005, 21_000_003, 15]]);
  });

  it("does not stop early on many repeated rows when a later row is independent", () => {
    const rows = [...Array.from({ length: 200 }, () => [1, -1, 0]), [0, 1, -1]];
    expect(nullSpace(sparse(rows), 3)).toEqual([[1, 1, 1]]);
    expect(rank(sparse(rows))).toBe(2);
  });

  it("gives the textbook conservation laws of Michaelis–Menten (E + C and S + C + P)", () => {
    // Species E, S, C, P; reaction vectors of E + S → C and C → E + P.
    expect(nullSpace(sparse([[-1, -1, 1, 0], [1, 0, -1, 1]]), 4)).toEqual([
      [1, 0, 1, 0],
      [0, 1, 1, 1],
    ]);
  });
});

describe("exact elimination on a dense random matrix", () => {
  it("stops once entries pass 256 bits instead of growing them for minutes", () => {
    // 60 × 120 with entries in [−3, 3]: a 60-dimensional kernel whose integer basis has entries
    // near the 60 × 60 minors, about 2^270; those were converted to doubles, silently inexact.
    let seed = 3;
    const random = () => ((seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) >>> 8) / 2 ** 24;
    const rows = Array.from({ length: 60 }, () => Array.from({ length: 120 }, () => Math.floor(random() * 7) - 3));
    expect(() => nullSpace(sparse(rows), 120)).toThrow(ExactSizeLimitError);
  });
});

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}
