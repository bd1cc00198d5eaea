// Exact linear algebra over the integers for stoichiometry: rank and integer null-space bases.
// Floating elimination with a tolerance can call a rank-deficient matrix full (or the reverse);
// deficiency and conservation laws are integers, so they are computed exactly.
//
// Rows are sparse and eliminated one at a time against an echelon basis whose pivot is each row's
// highest column, columns ordered so that rare species come last (eliminated first), which keeps
// fill-in low. The fast path works modulo a prime, lifts the kernel back to small rationals and
// verifies it against every row in integer arithmetic: rank mod p never exceeds the true rank, so
// a verified kernel of dimension width − rank mod p proves both rank and kernel. When lifting or
// verification fails (large entries), the same elimination runs fraction-free in bigint.

/**
 * The fraction-free elimination met an entry beyond `entryBitLimit` bits. Results are returned as
 * doubles, exact only below 2^53, and entries this large come from dense random-like matrices
 * whose bigint elimination runs for minutes: stopping says so at once instead.
 */
export class ExactSizeLimitError extends Error {
  override name = "ExactSizeLimitError";
}

const entryBitLimit = 256;
const entryLimit = 1n << BigInt(entryBitLimit);

/** A sparse integer vector: strictly increasing indices and their non-zero values. */
export interface SparseVector {
  indices: number[];
  values: number[];
}

/** Rank of the matrix whose rows are given. */
export function rank(rows: SparseVector[]): number {
  const problem = compress(rows);
  return problem.width - kernelBasis(problem).length;
}

/**
 * An integer basis of { x : row · x = 0 for every row } in Z^width: the reduced echelon basis
 * whose leading entries sit on the lowest possible columns, each vector primitive (gcd 1) with a
 * positive leading entry. For stoichiometry this reads naturally: E + C, S + C + P.
 */
export function nullSpace(rows: SparseVector[], width: number): number[][] {
  return sparseNullSpace(rows, width).map(({ indices, values }) => {
    const dense = new Array<number>(width).fill(0);
    indices.forEach((index, k) => (dense[index] = values[k]));
    return dense;
  });
}

/** Beyond this many vectors the basis is returned as computed rather than brought to reduced form. */
const canonicalLimit = 100;

/** The same basis as `nullSpace`, as sparse vectors: wide kernels are mostly zeros. */
export function sparseNullSpace(rows: SparseVector[], width: number): SparseVector[] {
  const problem = compress(rows);
  const basis = kernelBasis(problem).map(({ indices, values }) => sortedVector(indices.map((index) => problem.columns[index]), values));
  const inSupport = new Set(problem.columns);
  for (let column = 0; column < width; column++) {
    if (!inSupport.has(column)) basis.push({ indices: [column], values: [1] });
  }
  return basis.length <= canonicalLimit ? reducedFromTheLeft(basis, width) : basis;
}

// ---- the problem: only columns some row uses, renumbered into elimination order

interface Problem {
  rows: SparseVector[];
  width: number;
  /** columns[k] is the caller's column behind elimination column k. */
  columns: number[];
}

function compress(rows: SparseVector[]): Problem {
  const uses = new Map<number, number>();
  for (const row of rows) for (const index of row.indices) uses.set(index, (uses.get(index) ?? 0) + 1);
  // Frequent species (hubs such as H2O or ATP) first, rare ones last: rare columns become pivots
  // early and their rows spread no fill-in into the rest, the minimum-degree idea.
  const columns = [...uses.keys()].sort((a, b) => uses.get(b)! - uses.get(a)! || a - b);
  const position = new Map(columns.map((column, k) => [column, k]));
  const renumbered = rows.map((row) => sortedVector(row.indices.map((index) => position.get(index)!), row.values));
  return { rows: renumbered, width: columns.length, columns };
}

/** Sorts by index; insertion sort for the short rows stoichiometry mostly has. */
function sortedVector(indices: number[], values: number[]): SparseVector {
  if (indices.length > 16) {
    const order = indices.map((_, k) => k).sort((a, b) => indices[a] - indices[b]);
    return { indices: order.map((k) => indices[k]), values: order.map((k) => values[k]) };
  }
  const sortedIndices = indices.slice();
  const sortedValues = values.slice();
  for (let k = 1; k < sortedIndices.length; k++) {
    const index = sortedIndices[k];
    const value = sortedValues[k];
    let at = k - 1;
    for (; at >= 0 && sortedIndices[at] > index; at--) {
      sortedIndices[at + 1] = sortedIndices[at];
      sortedValues[at + 1] = sortedValues[at];
    }
    sortedIndices[at + 1] = index;
    sortedValues[at + 1] = value;
  }
  return { indices: sortedIndices, values: sortedValues };
}

function kernelBasis(problem: Problem): SparseVector[] {
  return modularKernel(problem) ?? integerKernel(problem);
}

// ---- modulo a prime, lifted and verified

/** Below 2^26, so the product of two residues (< 2^52) is exact in a double. */
const prime = 67_108_859;
/** Rational reconstruction recovers n/d with |n|, d up to √(p/2). */
const liftBound = Math.floor(Math.sqrt(prime / 2));

/**
 * A monic pivot row with an implicit 1 at its pivot; `columns` (ascending, all below the pivot)
 * and `values` hold the rest. Rows are reduced in a dense scratch array, so fill-in costs
 * typed-array arithmetic rather than merging and allocating sparse rows.
 */
interface ModularPivot {
  columns: number[];
  values: number[];
}

function modularKernel({ rows, width }: Problem): SparseVector[] | null {
  if (rows.some((row) => row.values.some((value) => Math.abs(value) > 2 ** 20))) return null;
  const pivots: (ModularPivot | undefined)[] = new Array(width);
  const work = new Float64Array(width);
  let found = 0;
  // Most rows of a big network add nothing new. After a run of rows without a new pivot, try to
  // finish: a kernel that annihilates every row, processed or not, settles rank and kernel.
  let patience = 32;
  let sinceLastPivot = 0;
  for (const row of rows) {
    if (found === width) return []; // full rank: every further row reduces to zero
    let top = -1;
    row.indices.forEach((index, k) => {
      work[index] = ((row.values[k] % prime) + prime) % prime;
      top = Math.max(top, index);
    });
    const column = reduceBelow(work, top, pivots);
    if (column >= 0) {
      pivots[column] = gatherMonic(work, column);
      found++;
      sinceLastPivot = 0;
    } else if (++sinceLastPivot === patience) {
      const kernel = liftedKernel(pivots, width, rows);
      if (kernel) return kernel;
      patience *= 2;
      sinceLastPivot = 0;
    }
  }
  return liftedKernel(pivots, width, rows);
}

/** Clears `work` of pivot columns from `top` down; returns the first column left without a pivot, or -1. */
function reduceBelow(work: Float64Array, top: number, pivots: (ModularPivot | undefined)[]): number {
  for (let column = top; column >= 0; column--) {
    const factor = work[column];
    if (factor === 0) continue;
    const pivot = pivots[column];
    if (!pivot) return column;
    const { columns, values } = pivot;
    for (let k = 0; k < columns.length; k++) {
      const j = columns[k];
      const value = (work[j] - factor * values[k]) % prime;
      work[j] = value < 0 ? value + prime : value;
    }
    work[column] = 0;
  }
  return -1;
}

/**
 * The kernel of the echelon rows mod p by back-substitution (x_free = 1, pivots ascending),
 * lifted to integers; null unless every vector lifts and annihilates every row exactly.
 */
function liftedKernel(pivots: (ModularPivot | undefined)[], width: number, rows: SparseVector[]): SparseVector[] | null {
  const basis: SparseVector[] = [];
  const x = new Float64Array(width);
  for (let free = 0; free < width; free++) {
    if (pivots[free]) continue;
    x.fill(0);
    x[free] = 1;
    for (let column = free + 1; column < width; column++) {
      const pivot = pivots[column];
      if (!pivot) continue;
      let sum = 0;
      for (let k = 0; k < pivot.columns.length; k++) sum = (sum + pivot.values[k] * x[pivot.columns[k]]) % prime;
      x[column] = sum === 0 ? 0 : prime - sum;
    }
    const fractions: { column: number; numerator: number; denominator: number }[] = [];
    for (let column = free; column < width; column++) {
      if (x[column] === 0) continue;
      const fraction = reconstruct(x[column]);
      if (!fraction) return null;
      fractions.push({ column, ...fraction });
    }
    const vector = integerVector(fractions);
    if (!vector || !annihilates(vector, rows)) return null;
    basis.push(vector);
  }
  return basis;
}

/** Takes the entries below `column` out of `work`, scaled so the pivot at `column` is 1. */
function gatherMonic(work: Float64Array, column: number): ModularPivot {
  const inverse = modularInverse(work[column]);
  work[column] = 0;
  for (let j = 0; j < column; j++) if (work[j] !== 0) work[j] = (work[j] * inverse) % prime;
  return gather(work, column);
}

function gather(work: Float64Array, column: number): ModularPivot {
  const columns: number[] = [];
  const values: number[] = [];
  for (let j = 0; j < column; j++) {
    if (work[j] === 0) continue;
    columns.push(j);
    values.push(work[j]);
    work[j] = 0;
  }
  return { columns, values };
}

function integerVector(fractions: { column: number; numerator: number; denominator: number }[]): SparseVector | null {
  let scale = 1;
  for (const { denominator } of fractions) {
    scale = (scale / gcdNumber(scale, denominator)) * denominator;
    if (scale > 2 ** 30) return null;
  }
  let divisor = 0;
  const entries = fractions.map(({ column, numerator, denominator }) => {
    const value = numerator * (scale / denominator);
    divisor = gcdNumber(divisor, Math.abs(value));
    return { column, value };
  });
  entries.sort((a, b) => a.column - b.column);
  return { indices: entries.map(({ column }) => column), values: entries.map(({ value }) => value / divisor) };
}

/** Whether row · vector = 0 for every row, exactly (bigint when a sum could leave the safe range). */
function annihilates(vector: SparseVector, rows: SparseVector[]): boolean {
  const weight = new Map(vector.indices.map((index, k) => [index, vector.values[k]]));
  for (const row of rows) {
    let sum = 0;
    let safe = true;
    for (let k = 0; k < row.indices.length; k++) {
      const entry = weight.get(row.indices[k]);
      if (entry === undefined) continue;
      sum += entry * row.values[k];
      if (Math.abs(sum) > 2 ** 52) safe = false;
    }
    if (safe ? sum !== 0 : bigDot(row, weight) !== 0n) return false;
  }
  return true;
}

function bigDot(row: SparseVector, weight: Map<number, number>): bigint {
  let sum = 0n;
  row.indices.forEach((index, k) => (sum += BigInt(weight.get(index) ?? 0) * BigInt(row.values[k])));
  return sum;
}

/** n/d ≡ value (mod p) with |n|, d ≤ liftBound, by the half-extended Euclidean algorithm. */
function reconstruct(value: number): { numerator: number; denominator: number } | null {
  let [r0, r1] = [prime, value];
  let [t0, t1] = [0, 1];
  while (r1 > liftBound) {
    const q = Math.floor(r0 / r1);
    [r0, r1] = [r1, r0 - q * r1];
    [t0, t1] = [t1, t0 - q * t1];
  }
  if (t1 === 0 || Math.abs(t1) > liftBound) return null;
  return t1 < 0 ? { numerator: -r1, denominator: -t1 } : { numerator: r1, denominator: t1 };
}

function modularInverse(value: number): number {
  let [r0, r1] = [prime, value];
  let [t0, t1] = [0, 1];
  while (r1 !== 0) {
    const q = Math.floor(r0 / r1);
    [r0, r1] = [r1, r0 - q * r1];
    [t0, t1] = [t1, t0 - q * t1];
  }
  return ((t0 % prime) + prime) % prime;
}

// ---- fraction-free over the integers (bigint): the fallback, and the final reduced form

/** A sparse bigint row sorted by column; its pivot is its highest column. */
interface Row {
  columns: number[];
  values: bigint[];
}

function integerKernel({ rows, width }: Problem): SparseVector[] {
  const pivots = reducedEchelon(rows);
  const byFree = new Map<number, { column: number; value: bigint; pivot: bigint }[]>();
  for (const [column, row] of pivots) {
    const pivot = row.values[row.values.length - 1];
    for (let k = 0; k < row.columns.length - 1; k++) {
      let entries = byFree.get(row.columns[k]);
      if (!entries) byFree.set(row.columns[k], (entries = []));
      entries.push({ column, value: row.values[k], pivot });
    }
  }
  const basis: SparseVector[] = [];
  for (let free = 0; free < width; free++) {
    if (pivots.has(free)) continue;
    const entries = byFree.get(free) ?? [];
    // x_free = L and x_pivot = −L·value/pivot, with L the lcm of the pivots involved.
    let scale = 1n;
    for (const { pivot } of entries) scale = lcm(scale, pivot);
    const vector = [{ column: free, value: scale }, ...entries.map(({ column, value, pivot }) => ({ column, value: (-scale * value) / pivot }))];
    vector.sort((a, b) => a.column - b.column);
    let divisor = 0n;
    for (const { value } of vector) divisor = gcd(divisor, abs(value));
    basis.push({ indices: vector.map(({ column }) => column), values: vector.map(({ value }) => Number(value / divisor)) });
  }
  return basis;
}

/** Reduced row echelon form keyed by pivot column: pivot rows hold their pivot and free columns only. */
function reducedEchelon(rows: SparseVector[]): Map<number, Row> {
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
  // Ascending, so each row is cleared with pivot rows that are already reduced; those hold only
  // free columns below their pivot, so the scan can continue downwards.
  for (const column of [...pivots.keys()].sort((a, b) => a - b)) {
    let row = pivots.get(column)!;
    let k = row.columns.length - 2;
    while (k >= 0) {
      const pivot = pivots.get(row.columns[k]);
      if (pivot) {
        const cleared = row.columns[k];
        row = normalise(eliminate(row, pivot, cleared));
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

/** a·row − b·pivot with the entry at `column` cancelled; both rows sorted by column. */
function eliminate(row: Row, pivot: Row, column: number): Row {
  const rowEntry = valueAt(row, column);
  const pivotEntry = valueAt(pivot, column);
  const g = gcd(abs(rowEntry), abs(pivotEntry));
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

/** Divides by the gcd of the entries (keeps numbers small) and makes the pivot positive. */
function normalise(row: Row): Row {
  if (row.values.length === 0) return row;
  let divisor = 0n;
  for (const value of row.values) {
    divisor = gcd(divisor, abs(value));
    if (divisor === 1n) break;
  }
  if (row.values[row.values.length - 1] < 0n) divisor = -divisor;
  const values = divisor === 1n ? row.values : row.values.map((value) => value / divisor);
  for (const value of values) {
    if (value >= entryLimit || value <= -entryLimit) {
      throw new ExactSizeLimitError(`exact elimination met numbers of more than ${entryBitLimit} bits; this network is too large and unstructured to analyse exactly`);
    }
  }
  return divisor === 1n ? row : { columns: row.columns, values };
}

/** The unique reduced echelon basis with leading entries on the lowest columns, primitive, leading entry positive. */
function reducedFromTheLeft(basis: SparseVector[], width: number): SparseVector[] {
  // Mirroring the columns turns "lowest column" into the "highest column" pivots used above.
  // Mirroring reverses the order of sorted indices, so reversing the arrays keeps them sorted.
  const mirror = (indices: number[], values: number[]): SparseVector => ({
    indices: indices.map((index) => width - 1 - index).reverse(),
    values: values.slice().reverse(),
  });
  const mirrored = basis.map(({ indices, values }) => mirror(indices, values));
  return [...reducedEchelon(mirrored).values()]
    .map((row) => mirror(row.columns, row.values.map(Number)))
    .sort((a, b) => a.indices[0] - b.indices[0]);
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

function gcdNumber(a: number, b: number): number {
  while (b !== 0) [a, b] = [b, a % b];
  return a;
}
