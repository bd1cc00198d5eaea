// Dense rational matrices, solved exactly by the same fraction-free elimination as the integer
// kernels: each row is scaled by the lcm of its denominators (the same equations, integer
// entries). Sizes here are those of a kinetic system or a realization, so no size limit applies.

import { addRow, echelonKernel, reducedEchelon, type Echelon, type IntegerRow } from "./fraction-free";
import { lcm } from "./integers";
import * as Q from "./rational";
import type { Rational } from "./rational";

/**
 * Some solution of A x = b, free unknowns set to 0 and pivots on the lowest columns (Gauss–Jordan
 * from the left), or null if there is none.
 */
export function solveLinear(a: readonly (readonly Rational[])[], b: readonly Rational[]): Rational[] | null {
  const width = a[0]?.length ?? 0;
  // Column 0 holds −b and unknown j sits at column width − j: the echelon's pivots are the highest
  // columns, so mirrored they are the lowest unknowns, and A x − b = 0 reads row · (1, x) = 0.
  const echelon = reducedEchelon(a.map((row, i) => integerRow([Q.neg(b[i]), ...row.slice().reverse()])));
  if (echelon.has(0)) return null;
  const x = new Array<Rational>(width).fill(Q.ZERO);
  for (const [column, row] of echelon) {
    const constant = row.columns[0] === 0 ? row.values[0] : 0n;
    x[width - column] = Q.rational(-constant, row.values[row.values.length - 1]);
  }
  return x;
}

export interface ReducedBasis {
  /** Basis vectors of the null space, each 1 at its leading column. */
  basis: Rational[][];
  /** leading[k] is the highest non-zero column of basis[k], where every other vector is 0. */
  leading: number[];
}

/**
 * The null space { x : row · x = 0 for every row } as its unique reduced echelon basis with leading
 * entries on the highest possible columns, each scaled to a leading 1.
 */
export function reducedNullSpace(rows: readonly (readonly Rational[])[], width: number): ReducedBasis {
  // Mirrored columns: the echelon kernel leads on its lowest columns, which are our highest.
  const mirror = (column: number) => width - 1 - column;
  const echelon = reducedEchelon(rows.map((row) => integerRow(row.slice().reverse())));
  // Reversed, so the leading columns ascend.
  const kernel = echelonKernel(echelon, width).reverse();
  const basis = kernel.map(({ columns, values }) => {
    const vector = new Array<Rational>(width).fill(Q.ZERO);
    columns.forEach((column, k) => (vector[mirror(column)] = Q.rational(values[k], values[0])));
    return vector;
  });
  return { basis, leading: kernel.map(({ columns }) => mirror(columns[0])) };
}

/** The rows, in order, that are independent of the rows before them: a basis of the row space. */
export function independentRows(rows: readonly (readonly Rational[])[]): number[] {
  const echelon: Echelon = new Map();
  return rows.flatMap((row, index) => (addRow(echelon, integerRow(row)) >= 0 ? [index] : []));
}

/** The row's non-zero entries times the lcm of its denominators, as a sparse integer row. */
function integerRow(row: readonly Rational[]): IntegerRow {
  let scale = 1n;
  for (const value of row) if (!Q.isZero(value)) scale = lcm(scale, value.den);
  const columns: number[] = [];
  const values: bigint[] = [];
  row.forEach((value, column) => {
    if (Q.isZero(value)) return;
    columns.push(column);
    values.push((value.num * scale) / value.den);
  });
  return { columns, values };
}
