// The Markowitz-ordered modular kernel against the fraction-free elimination in its fixed column
// order: the same kernel, compared in the unique reduced form, whichever share of the work the
// sparse steps and the dense core take.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { generatedMechanism } from "../../../tests/bench/structure";
import { buildNetwork, reactionVector } from "../network";
import { parseMechanism } from "../parse";
import { echelonKernel, reducedEchelon, type IntegerRow } from "./fraction-free";
import { denseShare } from "./markowitz";
import { modularKernel } from "./modular";
import type { SparseVector } from "./sparse";

const toInteger = ({ indices, values }: SparseVector): IntegerRow => ({ columns: indices.slice(), values: values.map(BigInt) });

/** The unique reduced echelon form of the span, as text for comparison. */
function canonical(basis: IntegerRow[]): string[] {
  return [...reducedEchelon(basis).entries()]
    .sort(([a], [b]) => a - b)
    .map(([, { columns, values }]) => columns.map((column, k) => `${values[k]}@${column}`).join(" "));
}

function referenceKernel(rows: SparseVector[], width: number): string[] {
  return canonical(echelonKernel(reducedEchelon(rows.map(toInteger)), width));
}

/** Sparse rows, a few non-zeros each, some of them sums of earlier rows (so dependent rows are common). */
const sparseMatrix = fc
  .tuple(fc.integer({ min: 1, max: 30 }), fc.integer({ min: 1, max: 30 }))
  .chain(([height, width]) =>
    fc
      .array(
        fc.tuple(fc.array(fc.tuple(fc.integer({ min: 0, max: width - 1 }), fc.integer({ min: -3, max: 3 })), { minLength: 1, maxLength: 4 }), fc.nat(), fc.boolean()),
        { minLength: height, maxLength: height },
      )
      .map((specs) => {
        const rows: Map<number, number>[] = [];
        for (const [entries, earlier, combine] of specs) {
          const row = new Map<number, number>();
          for (const [column, value] of entries) row.set(column, (row.get(column) ?? 0) + value);
          if (combine && rows.length > 0) for (const [column, value] of rows[earlier % rows.length]) row.set(column, (row.get(column) ?? 0) - 2 * value);
          rows.push(row);
        }
        const sparse = rows.map((row): SparseVector => {
          const indices = [...row.keys()].filter((column) => row.get(column) !== 0).sort((a, b) => a - b);
          return { indices, values: indices.map((column) => row.get(column)!) };
        });
        return { rows: sparse, width };
      }),
  );

describe("the modular kernel in Markowitz order", () => {
  it("spans the fraction-free kernel, sparse steps only, dense core only, or both", () => {
    fc.assert(
      fc.property(sparseMatrix, ({ rows, width }) => {
        const expected = referenceKernel(rows, width);
        for (const denseFrom of [0, denseShare, Infinity]) {
          const basis = modularKernel(rows, width, denseFrom);
          if (basis) expect(canonical(basis.map(toInteger))).toEqual(expected);
        }
      }),
      { numRuns: 300 },
    );
  });

  it("agrees with the fraction-free kernel on generated networks up to 2,500 reactions", () => {
    for (const [reactions, species] of [
      [100, 40],
      [1000, 400],
      [2500, 1000],
    ]) {
      const network = buildNetwork(parseMechanism(generatedMechanism(reactions, species)).mechanism);
      const vectors = network.reactions.map((reaction) => reactionVector(network, reaction));
      const width = network.species.length;
      const laws = modularKernel(vectors, width);
      expect(laws).not.toBeNull();
      expect(canonical(laws!.map(toInteger))).toEqual(referenceKernel(vectors, width));
    }
  });
});
