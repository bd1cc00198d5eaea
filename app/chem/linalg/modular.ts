// Elimination modulo a prime, lifted and verified: the fast path to an exact kernel. Rank mod p
// never exceeds the true rank, so a lifted kernel of dimension width − rank mod p that annihilates
// every row exactly proves both the rank and the kernel. Rows are sparse; each is reduced in a
// dense scratch array against monic pivot rows whose pivot is the row's highest column.

import { smallGcd } from "./integers";
import type { SparseVector } from "./sparse";

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

/**
 * An integer kernel basis of the rows (x_free = 1 on each free column, so leading entries on the
 * lowest columns), or null when the rows' entries are too large for the prime, a kernel vector
 * does not lift to small rationals, or a lifted vector fails the exact check.
 */
export function modularKernel(rows: SparseVector[], width: number): SparseVector[] | null {
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
    scale = (scale / smallGcd(scale, denominator)) * denominator;
    if (scale > 2 ** 30) return null;
  }
  let divisor = 0;
  const entries = fractions.map(({ column, numerator, denominator }) => {
    const value = numerator * (scale / denominator);
    divisor = smallGcd(divisor, Math.abs(value));
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
