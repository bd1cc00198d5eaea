import { describe, expect, it } from "vitest";
import { dormandPrince54 } from "./dormand-prince";
import { rodas4 } from "./rodas4";
import { accumulatedSum, scaledSum } from "./weighted-sums";

const n = 5;
const vectors = Array.from({ length: 7 }, (_, j) => Float64Array.from({ length: n }, (_, i) => Math.sin(1 + 3 * j + i) * 10 ** (i - 2)));
const base = Float64Array.from({ length: n }, (_, i) => Math.cos(i) - 0.5);

const rows = [...dormandPrince54.a, dormandPrince54.b, dormandPrince54.e, dormandPrince54.dense, ...rodas4.a, ...rodas4.c, rodas4.m, rodas4.e, [0, 0]];

/** The unrolled formula, term after term from the left, as a hand-written stage would read. */
function byHand(row: readonly number[], start: number | null, scale: number, i: number): number {
  const nonZero = row.flatMap((w, j) => (w === 0 ? [] : [w * vectors[j][i]]));
  if (nonZero.length === 1) {
    const lone = row.findIndex((w) => w !== 0);
    return (start ?? 0) + scale * row[lone] * vectors[lone][i];
  }
  const sum = nonZero.length === 0 ? 0 : nonZero.reduce((a, b) => a + b);
  return start === null ? scale * sum : start + scale * sum;
}

describe("weighted sums of stage vectors", () => {
  for (const generate of [true, false]) {
    it(`round exactly as the unrolled formula (${generate ? "generated code" : "table-driven"})`, () => {
      for (const row of rows) {
        const out = new Float64Array(n);
        scaledSum(row, { generate })(out, base, 0.37, vectors);
        out.forEach((value, i) => expect(value).toBe(byHand(row, base[i], 0.37, i)));
        scaledSum(row, { generate })(out, null, 0.37, vectors);
        out.forEach((value, i) => expect(value).toBe(byHand(row, null, 0.37, i)));
        accumulatedSum(row, { generate })(out, base, vectors);
        out.forEach((value, i) => expect(value).toBe(row.reduce((sum, w, j) => (w === 0 ? sum : sum + w * vectors[j][i]), base[i])));
      }
    });
  }
});
