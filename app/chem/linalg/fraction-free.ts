// Fraction-free elimination over the integers (bigint): the exact fallback when the modular path
// cannot lift a kernel, the reduced form of a kernel basis, and the elimination behind rational
// solving. Rows are sparse and sorted by column; a row's pivot is its highest column, and every
// row is divided by the gcd of its entries, so numbers stay as small as exactness allows.

import { abs, gcd, lcm } from "./integers";

/**
 * The elimination met an entry beyond the caller's size limit. Entries this large come from dense
 * random-like matrices whose bigint elimination runs for minutes: stopping says so at once.
 */
export class ExactSizeLimitError extends Error {
  override name = "ExactSizeLimitError";
}

/** A sparse bigint row sorted by column; its pivot is its highest column. */
export interface IntegerRow {
  columns: number[];
  values: bigint[];
}

/** Reduced row echelon form keyed by pivot column: pivot rows hold their pivot and free columns only. */
export type Echelon = Map<number, IntegerRow>;

/** Entries must stay below 2^bits; elimination without one has no limit. */
export interface SizeLimit {
  bits: number;
  bound: bigint;
  negativeBound: bigint;
}

export function sizeLimit(bits: number): SizeLimit {
  const bound = 1n << BigInt(bits);
  return { bits, bound, negativeBound: -bound };
}

/**
 * Adds a row to an echelon form that is not yet reduced, the incremental half of `reducedEchelon`.
 * Returns the column of the new pivot, or -1 when the row depends on the rows already there.
 */
export function addRow(pivots: Echelon, input: IntegerRow, limit?: SizeLimit): number {
  let row = input;
  while (row.columns.length > 0) {
    const column = row.columns[row.columns.length - 1];
    const pivot = pivots.get(column);
    if (!pivot) {
      pivots.set(column, normalise(row, limit));
      return column;
    }
    row = normalise(eliminate(row, pivot, column), limit);
  }
  return -1;
}

export function reducedEchelon(rows: IntegerRow[], limit?: SizeLimit): Echelon {
  const pivots: Echelon = new Map();
  for (const row of rows) addRow(pivots, row, limit);
  // Ascending, so each row is cleared with pivot rows that are already reduced; those hold only
  // free columns below their pivot, so the scan can continue downwards.
  for (const column of [...pivots.keys()].sort((a, b) => a - b)) {
    let row = pivots.get(column)!;
    let k = row.columns.length - 2;
    while (k >= 0) {
      const pivot = pivots.get(row.columns[k]);
      if (pivot) {
        const cleared = row.columns[k];
        row = normalise(eliminate(row, pivot, cleared), limit);
        k = row.columns.length - 1;
        while (k >= 0 && row.columns[k] >= cleared) k--;
      } else {
        k--;
      }
    }
    pivots.set(column, row);
  }
  return pivots;
}

/**
 * A primitive integer basis of the kernel of a reduced echelon form: one vector per free column f,
 * x_f = L and x_pivot = −L·value/pivot with L the lcm of the pivots involved. Each vector's lowest
 * column is its free column, where every other vector is 0.
 */
export function echelonKernel(pivots: Echelon, width: number): IntegerRow[] {
  const byFree = new Map<number, { column: number; value: bigint; pivot: bigint }[]>();
  for (const [column, row] of pivots) {
    const pivot = row.values[row.values.length - 1];
    for (let k = 0; k < row.columns.length - 1; k++) {
      let entries = byFree.get(row.columns[k]);
      if (!entries) byFree.set(row.columns[k], (entries = []));
      entries.push({ column, value: row.values[k], pivot });
    }
  }
  const basis: IntegerRow[] = [];
  for (let free = 0; free < width; free++) {
    if (pivots.has(free)) continue;
    const entries = byFree.get(free) ?? [];
    let scale = 1n;
    for (const { pivot } of entries) scale = lcm(scale, pivot);
    const vector = [{ column: free, value: scale }, ...entries.map(({ column, value, pivot }) => ({ column, value: (-scale * value) / pivot }))];
    vector.sort((a, b) => a.column - b.column);
    let divisor = 0n;
    for (const { value } of vector) divisor = gcd(divisor, value);
    basis.push({ columns: vector.map(({ column }) => column), values: vector.map(({ value }) => value / divisor) });
  }
  return basis;
}

/** a·row − b·pivot with the entry at `column` cancelled; both rows sorted by column. */
function eliminate(row: IntegerRow, pivot: IntegerRow, column: number): IntegerRow {
  const rowEntry = valueAt(row, column);
  const pivotEntry = valueAt(pivot, column);
  const g = gcd(rowEntry, pivotEntry);
  const a = pivotEntry / g;
  const b = rowEntry / g;
  const columns: number[] = [];
  const values: bigint[] = [];
  let i = 0;
  let j = 0;
  while (i < row.columns.length || j < pivot.columns.length) {
    const ci = i < row.columns.length ? row.columns[i] : Infinity;
    const cj = j < pivot.columns.length ? pivot.columns[j] : Infinity;
    const at = Math.min(ci, cj);
    const x = ci === at ? row.values[i++] : 0n;
    const y = cj === at ? pivot.values[j++] : 0n;
    const value = a * x - b * y;
    if (value !== 0n) {
      columns.push(at);
      values.push(value);
    }
  }
  return { columns, values };
}

function valueAt(row: IntegerRow, column: number): bigint {
  let low = 0;
  let high = row.columns.length - 1;
  while (low <= high) {
    const middle = (low + high) >> 1;
    if (row.columns[middle] === column) return row.values[middle];
    if (row.columns[middle] < column) low = middle + 1;
    else high = middle - 1;
  }
  return 0n;
}

/** Divides by the gcd of the entries (keeps numbers small) and makes the pivot positive. */
function normalise(row: IntegerRow, limit?: SizeLimit): IntegerRow {
  if (row.values.length === 0) return row;
  let divisor = 0n;
  for (const value of row.values) {
    divisor = gcd(divisor, abs(value));
    if (divisor === 1n) break;
  }
  if (row.values[row.values.length - 1] < 0n) divisor = -divisor;
  const values = divisor === 1n ? row.values : row.values.map((value) => value / divisor);
  if (limit) {
    for (const value of values) {
      if (value >= limit.bound || value <= limit.negativeBound) {
        throw new ExactSizeLimitError(`exact elimination met numbers of more than ${limit.bits} bits; this network is too large and unstructured to analyse exactly`);
      }
    }
  }
  return divisor === 1n ? row : { columns: row.columns, values };
}
