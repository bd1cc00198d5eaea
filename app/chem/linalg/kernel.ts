// Rank and integer kernel bases of integer matrices, exactly. Floating elimination with a
// tolerance can call a rank-deficient matrix full (or the reverse); deficiency and conservation
// laws are integers, so they are computed exactly.
//
// The method is chosen here: modulo a prime in Markowitz order, lifted and verified (modular.ts),
// and when that fails (large entries) fraction-free in bigint (fraction-free.ts) in the column
// order of column-order.ts. Both give the same kernel; up to `canonicalLimit` vectors it is brought
// to one reduced form, so the basis does not depend on the path.

import { eliminationOrder } from "./column-order";
import { echelonKernel, reducedEchelon, sizeLimit, type IntegerRow } from "./fraction-free";
import { modularKernel } from "./modular";
import { denseFromSparse, sortedVector, type SparseVector } from "./sparse";

/**
 * Results are doubles, exact only below 2^53, and entries past 256 bits come from dense
 * random-like matrices whose bigint elimination runs for minutes: beyond it the fraction-free
 * path throws ExactSizeLimitError.
 */
const entryLimit = sizeLimit(256);

/** Rank of the matrix whose rows are given. */
export function rank(rows: SparseVector[]): number {
  const ordered = eliminationOrder(rows);
  return ordered.width - kernelBasis(ordered.rows, ordered.width).length;
}

/**
 * An integer basis of { x : row · x = 0 for every row } in Z^width: the reduced echelon basis
 * whose leading entries sit on the lowest possible columns, each vector primitive (gcd 1) with a
 * positive leading entry. For stoichiometry this reads naturally: E + C, S + C + P.
 */
export function nullSpace(rows: SparseVector[], width: number): number[][] {
  return sparseNullSpace(rows, width).map((vector) => denseFromSparse(vector, width));
}

/**
 * Beyond this many vectors the basis is returned as computed rather than brought to reduced form:
 * one vector per free column of the elimination that succeeded, so which columns those are depends
 * on its pivot order.
 */
const canonicalLimit = 100;

/** The same basis as `nullSpace`, as sparse vectors: wide kernels are mostly zeros. */
export function sparseNullSpace(rows: SparseVector[], width: number): SparseVector[] {
  const ordered = eliminationOrder(rows);
  const basis = kernelBasis(ordered.rows, ordered.width).map(({ indices, values }) =>
    sortedVector(indices.map((index) => ordered.columns[index]), values),
  );
  const inSupport = new Set(ordered.columns);
  for (let column = 0; column < width; column++) {
    if (!inSupport.has(column)) basis.push({ indices: [column], values: [1] });
  }
  return basis.length <= canonicalLimit ? reducedFromTheLeft(basis, width) : basis;
}

function kernelBasis(rows: SparseVector[], width: number): SparseVector[] {
  return modularKernel(rows, width) ?? fractionFreeKernel(rows, width);
}

function fractionFreeKernel(rows: SparseVector[], width: number): SparseVector[] {
  const echelon = reducedEchelon(rows.map(integerRow), entryLimit);
  return echelonKernel(echelon, width).map(({ columns, values }) => ({ indices: columns, values: values.map(Number) }));
}

/** The unique reduced echelon basis with leading entries on the lowest columns, primitive, leading entry positive. */
function reducedFromTheLeft(basis: SparseVector[], width: number): SparseVector[] {
  // Mirroring the columns turns "lowest column" into the "highest column" pivots of the echelon.
  // Mirroring reverses the order of sorted indices, so reversing the arrays keeps them sorted.
  const mirror = (indices: number[]) => indices.map((index) => width - 1 - index).reverse();
  const mirrored = basis.map(({ indices, values }): IntegerRow => ({ columns: mirror(indices), values: values.map(BigInt).reverse() }));
  return [...reducedEchelon(mirrored, entryLimit).values()]
    .map(({ columns, values }) => ({ indices: mirror(columns), values: values.map(Number).reverse() }))
    .sort((a, b) => a.indices[0] - b.indices[0]);
}

function integerRow({ indices, values }: SparseVector): IntegerRow {
  return { columns: indices.slice(), values: values.map(BigInt) };
}
