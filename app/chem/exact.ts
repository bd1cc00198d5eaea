// Exact linear algebra over the integers for stoichiometry: rank and integer null-space bases.
// Floating elimination with a tolerance can call a rank-deficient matrix full (or the reverse);
// deficiency and conservation laws are integers, so they are computed with bigint arithmetic.
//
// Rows are sparse and eliminated one at a time against an echelon basis whose pivot is each row's
// highest column (fraction-free: r ← a·r − b·p, then r is divided by the gcd of its entries).
// Chemistry gives very sparse rows with small coefficients, so fill-in and growth stay small and
// the cost follows the non-zeros rather than the dense size.

/** A sparse integer vector: strictly increasing indices and their non-zero values. */
export interface SparseVector {
  indices: number[];
  values: number[];
}

interface Row {
  columns: number[];
  values: bigint[];
}

/** Rank of the matrix whose rows are given. */
export function rank(rows: SparseVector[]): number {
  return echelon(rows).size;
}

/**
 * An integer basis of { x : row · x = 0 for every row } in Z^width, each vector primitive (its
 * entries have gcd 1) with a positive entry at the free column it stands for.
 */
export function nullSpace(rows: SparseVector[], width: number): number[][] {
  return sparseNullSpace(rows, width).map(({ indices, values }) => {
    const dense = new Array<number>(width).fill(0);
    indices.forEach((index, k) => (dense[index] = values[k]));
    return dense;
  });
}

/** The same basis as `nullSpace`, as sparse vectors: wide kernels are mostly zeros. */
export function sparseNullSpace(rows: SparseVector[], width: number): SparseVector[] {
  const pivots = echelon(rows);
  const pivotColumns = [...pivots.keys()].sort((a, b) => a - b);
  for (const column of pivotColumns) backSubstitute(pivots.get(column)!, pivots);

  // After back-substitution each pivot row holds its pivot and free columns only.
  const byFree = new Map<number, { column: number; value: bigint; pivot: bigint }[]>();
  for (const column of pivotColumns) {
    const row = pivots.get(column)!;
    const pivot = row.values[row.values.length - 1];
    for (let k = 0; k < row.columns.length - 1; k++) {
      const free = row.columns[k];
      let entries = byFree.get(free);
      if (!entries) byFree.set(free, (entries = []));
      entries.push({ column, value: row.values[k], pivot });
    }
  }

  const basis: SparseVector[] = [];
  for (let free = 0; free < width; free++) {
    if (pivots.has(free)) continue;
    const entries = byFree.get(free) ?? [];
    // x_free = L and x_pivot = −L·value/pivot, with L the lcm of the pivots involved.
    let scale = 1n;
    for (const { pivot } of entries) scale = lcm(scale, abs(pivot));
    const vector = [{ index: free, value: scale }, ...entries.map(({ column, value, pivot }) => ({ index: column, value: (-scale * value) / pivot }))];
    vector.sort((a, b) => a.index - b.index);
    let divisor = 0n;
    for (const { value } of vector) divisor = gcd(divisor, abs(value));
    basis.push({ indices: vector.map(({ index }) => index), values: vector.map(({ value }) => Number(value / divisor)) });
  }
  return basis;
}

/** Row echelon form keyed by pivot column (each row's highest column). */
function echelon(rows: SparseVector[]): Map<number, Row> {
  const pivots = new Map<number, Row>();
  for (const input of rows) {
    let row: Row = { columns: input.indices.slice(), values: input.values.map(BigInt) };
    while (row.columns.length > 0) {
      const column = row.columns[row.columns.length - 1];
      const pivot = pivots.get(column);
      if (!pivot) {
        pivots.set(column, normalise(row));
        break;
      }
      row = normalise(eliminate(row, pivot, column));
    }
  }
  return pivots;
}

/** Clears `row`'s entries in pivot columns other than its own, using rows already so reduced. */
function backSubstitute(row: Row, pivots: Map<number, Row>): void {
  let current = row;
  // Reduced pivot rows hold only free columns below their pivot, so the scan can go on downwards.
  let k = current.columns.length - 2;
  while (k >= 0) {
    const column = current.columns[k];
    const pivot = pivots.get(column);
    if (pivot) {
      current = normalise(eliminate(current, pivot, column));
      k = firstBelow(current.columns, column);
    } else {
      k--;
    }
  }
  pivots.set(current.columns[current.columns.length - 1], current);
}

function firstBelow(columns: number[], column: number): number {
  let k = columns.length - 1;
  while (k >= 0 && columns[k] >= column) k--;
  return k;
}

/** a·row − b·pivot with the entry at `column` cancelled; both rows sorted by column. */
function eliminate(row: Row, pivot: Row, column: number): Row {
  const a0 = valueAt(pivot, column);
  const b0 = valueAt(row, column);
  const g = gcd(abs(a0), abs(b0));
  const a = a0 / g;
  const b = b0 / g;
  const columns: number[] = [];
  const values: bigint[] = [];
  let i = 0;
  let j = 0;
  while (i < row.columns.length || j < pivot.columns.length) {
    const ci = i < row.columns.length ? row.columns[i] : Infinity;
    const cj = j < pivot.columns.length ? pivot.columns[j] : Infinity;
    let value: bigint;
    let at: number;
    if (ci === cj) {
      value = a * row.values[i++] - b * pivot.values[j++];
      at = ci;
    } else if (ci < cj) {
      value = a * row.values[i++];
      at = ci;
    } else {
      value = -b * pivot.values[j++];
      at = cj;
    }
    if (value !== 0n) {
      columns.push(at);
      values.push(value);
    }
  }
  return { columns, values };
}

function valueAt(row: Row, column: number): bigint {
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

/** Divides by the gcd of the entries and makes the pivot (highest column) positive. */
function normalise(row: Row): Row {
  let divisor = 0n;
  for (const value of row.values) {
    divisor = gcd(divisor, abs(value));
    if (divisor === 1n) break;
  }
  if (row.values[row.values.length - 1] < 0n) divisor = -divisor;
  if (divisor === 1n) return row;
  return { columns: row.columns, values: row.values.map((value) => value / divisor) };
}

function abs(value: bigint): bigint {
  return value < 0n ? -value : value;
}

function gcd(a: bigint, b: bigint): bigint {
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}

function lcm(a: bigint, b: bigint): bigint {
  return (a / gcd(a, b)) * b;
}
