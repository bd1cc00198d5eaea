// The linear solver of the BDF: factors s·I − J and solves with the factors, as shifted-lu.ts does.
// Sparse with diagonal pivots in the minimum-degree order (the order, fill pattern and dense tail
// come from symbolic.ts, the port of sparse-lu.ts's symbolic factorisation, with pattern slots as
// sources); dense partial pivoting when the system is small or dense, or a sparse pivot is too small.

import { jacobian, n, patternColumn, patternStart } from "./system";

const PIVOT_THRESHOLD: f64 = 1e-10;

export let factorizations: i32 = 0;
let sparse = false;
let order: StaticArray<i32> = [];
let sourceStart: StaticArray<i32> = [];
let sourceSlot: StaticArray<i32> = [];
let sourceColumn: StaticArray<i32> = [];
let lowerStart: StaticArray<i32> = [];
let lowerColumn: StaticArray<i32> = [];
let upperStart: StaticArray<i32> = [];
let upperColumn: StaticArray<i32> = [];
/** Per position: the pattern slot of its diagonal entry, −1 when J's diagonal is structurally 0. */
let diagonalSlot: StaticArray<i32> = [];
let tailStart: i32 = 0;
let lowerValue: StaticArray<f64> = [];
let upperValue: StaticArray<f64> = [];
let diagonal: StaticArray<f64> = [];
let work: StaticArray<f64> = [];
let tail: StaticArray<f64> = [];
let rowSize: StaticArray<f64> = [];
/** Which factors the last successful `factor` left: 1 sparse, 2 dense, 0 none. */
let factors: i32 = 0;
let dense: StaticArray<f64> = [];
let pivots: StaticArray<i32> = [];

/** The solver for a new system: sparse with these tables, or (useSparse false, tables empty) dense only. */
export function configureSolver(
  useSparse: bool,
  orders: StaticArray<i32>,
  sourceStarts: StaticArray<i32>,
  sourceSlots: StaticArray<i32>,
  sourceColumns: StaticArray<i32>,
  lowerStarts: StaticArray<i32>,
  lowerColumns: StaticArray<i32>,
  upperStarts: StaticArray<i32>,
  upperColumns: StaticArray<i32>,
  diagonalSlots: StaticArray<i32>,
  tailFrom: i32,
): void {
  sparse = useSparse;
  factors = 0;
  factorizations = 0;
  dense = [];
  order = orders;
  sourceStart = sourceStarts;
  sourceSlot = sourceSlots;
  sourceColumn = sourceColumns;
  lowerStart = lowerStarts;
  lowerColumn = lowerColumns;
  upperStart = upperStarts;
  upperColumn = upperColumns;
  diagonalSlot = diagonalSlots;
  tailStart = tailFrom;
  const m = n - tailFrom;
  lowerValue = new StaticArray<f64>(lowerColumns.length);
  upperValue = new StaticArray<f64>(upperColumns.length);
  diagonal = new StaticArray<f64>(n);
  work = new StaticArray<f64>(n);
  tail = new StaticArray<f64>(m * m);
  rowSize = new StaticArray<f64>(n);
}

/** Factors s·I − J for the current `jacobian`; false when it is numerically singular. */
export function factor(shift: f64): bool {
  factorizations++;
  if (sparse && factorSparse(shift)) {
    factors = 1;
    return true;
  }
  factors = factorDense(shift) ? 2 : 0;
  return factors != 0;
}

export function solve(b: StaticArray<f64>): void {
  if (factors == 1) solveSparse(b);
  else solveDense(b);
}

function factorSparse(shift: f64): bool {
  const m = n - tailStart;
  for (let p = 0; p < n; p++) {
    const slot = unchecked(diagonalSlot[p]);
    const onDiagonal = shift - (slot < 0 ? 0 : unchecked(jacobian[slot]));
    unchecked((work[p] = onDiagonal));
    let size = Math.abs(onDiagonal);
    const sourceEnd = unchecked(sourceStart[p + 1]);
    for (let e = unchecked(sourceStart[p]); e < sourceEnd; e++) {
      const value = -unchecked(jacobian[unchecked(sourceSlot[e])]);
      unchecked((work[unchecked(sourceColumn[e])] = value));
      size = Math.max(size, Math.abs(value));
    }
    unchecked((rowSize[p] = size));
    const lowerEnd = unchecked(lowerStart[p + 1]);
    for (let e = unchecked(lowerStart[p]); e < lowerEnd; e++) {
      const k = unchecked(lowerColumn[e]);
      const multiplier = unchecked(work[k]) / unchecked(diagonal[k]);
      unchecked((work[k] = 0));
      unchecked((lowerValue[e] = multiplier));
      if (multiplier == 0) continue;
      const upperEnd = unchecked(upperStart[k + 1]);
      for (let f = unchecked(upperStart[k]); f < upperEnd; f++) unchecked((work[unchecked(upperColumn[f])] -= multiplier * unchecked(upperValue[f])));
    }
    if (p >= tailStart) {
      const row = (p - tailStart) * m;
      for (let c = 0; c < m; c++) {
        unchecked((tail[row + c] = unchecked(work[tailStart + c])));
        unchecked((work[tailStart + c] = 0));
      }
      continue;
    }
    const pivot = unchecked(work[p]);
    unchecked((work[p] = 0));
    if (!(Math.abs(pivot) > PIVOT_THRESHOLD * size)) {
      for (let i = 0; i < n; i++) unchecked((work[i] = 0));
      return false;
    }
    unchecked((diagonal[p] = pivot));
    const upperEnd = unchecked(upperStart[p + 1]);
    for (let f = unchecked(upperStart[p]); f < upperEnd; f++) {
      const column = unchecked(upperColumn[f]);
      unchecked((upperValue[f] = unchecked(work[column])));
      unchecked((work[column] = 0));
    }
  }
  for (let k = 0; k < m; k++) {
    const pivot = unchecked(tail[k * m + k]);
    if (!(Math.abs(pivot) > PIVOT_THRESHOLD * unchecked(rowSize[tailStart + k]))) return false;
    unchecked((diagonal[tailStart + k] = pivot));
    const inverse = 1 / pivot;
    for (let i = k + 1; i < m; i++) {
      const rowI = i * m;
      const multiplier = unchecked(tail[rowI + k]) * inverse;
      unchecked((tail[rowI + k] = multiplier));
      if (multiplier == 0) continue;
      const rowK = k * m;
      for (let j = k + 1; j < m; j++) unchecked((tail[rowI + j] -= multiplier * unchecked(tail[rowK + j])));
    }
  }
  return true;
}

function solveSparse(b: StaticArray<f64>): void {
  const m = n - tailStart;
  const x = work;
  for (let p = 0; p < n; p++) {
    let sum = unchecked(b[unchecked(order[p])]);
    const lowerEnd = unchecked(lowerStart[p + 1]);
    for (let e = unchecked(lowerStart[p]); e < lowerEnd; e++) sum -= unchecked(lowerValue[e]) * unchecked(x[unchecked(lowerColumn[e])]);
    if (p >= tailStart) {
      const row = (p - tailStart) * m;
      for (let c = 0; c < p - tailStart; c++) sum -= unchecked(tail[row + c]) * unchecked(x[tailStart + c]);
    }
    unchecked((x[p] = sum));
  }
  for (let p = n - 1; p >= tailStart; p--) {
    const row = (p - tailStart) * m;
    let sum = unchecked(x[p]);
    for (let c = p - tailStart + 1; c < m; c++) sum -= unchecked(tail[row + c]) * unchecked(x[tailStart + c]);
    unchecked((x[p] = sum / unchecked(diagonal[p])));
  }
  for (let p = tailStart - 1; p >= 0; p--) {
    let sum = unchecked(x[p]);
    const upperEnd = unchecked(upperStart[p + 1]);
    for (let f = unchecked(upperStart[p]); f < upperEnd; f++) sum -= unchecked(upperValue[f]) * unchecked(x[unchecked(upperColumn[f])]);
    unchecked((x[p] = sum / unchecked(diagonal[p])));
  }
  for (let p = 0; p < n; p++) {
    unchecked((b[unchecked(order[p])] = unchecked(x[p])));
    unchecked((x[p] = 0));
  }
}

/** dense-lu.ts's partial pivoting on s·I − J, J spread from the pattern (−0 where it has no entry, as −J of a dense 0). */
function factorDense(shift: f64): bool {
  if (dense.length != n * n) {
    dense = new StaticArray<f64>(n * n);
    pivots = new StaticArray<i32>(n);
  }
  const lu = dense;
  for (let i = 0; i < n * n; i++) unchecked((lu[i] = -0.0));
  for (let i = 0; i < n; i++) {
    const end = unchecked(patternStart[i + 1]);
    for (let s = unchecked(patternStart[i]); s < end; s++) unchecked((lu[i * n + unchecked(patternColumn[s])] = -unchecked(jacobian[s])));
  }
  for (let i = 0; i < n; i++) unchecked((lu[i * n + i] += shift));
  for (let k = 0; k < n; k++) {
    let pivotRow = k;
    let pivotSize = Math.abs(unchecked(lu[k * n + k]));
    for (let i = k + 1; i < n; i++) {
      const size = Math.abs(unchecked(lu[i * n + k]));
      if (size > pivotSize) {
        pivotSize = size;
        pivotRow = i;
      }
    }
    unchecked((pivots[k] = pivotRow));
    if (pivotSize == 0 || !isFinite(pivotSize)) return false;
    if (pivotRow != k) {
      const a = k * n;
      const b = pivotRow * n;
      for (let j = 0; j < n; j++) {
        const swap = unchecked(lu[a + j]);
        unchecked((lu[a + j] = unchecked(lu[b + j])));
        unchecked((lu[b + j] = swap));
      }
    }
    const rowK = k * n;
    const inversePivot = 1 / unchecked(lu[rowK + k]);
    for (let i = k + 1; i < n; i++) {
      const rowI = i * n;
      const multiplier = unchecked(lu[rowI + k]) * inversePivot;
      if (multiplier == 0) continue;
      unchecked((lu[rowI + k] = multiplier));
      for (let j = k + 1; j < n; j++) unchecked((lu[rowI + j] -= multiplier * unchecked(lu[rowK + j])));
    }
  }
  return true;
}

function solveDense(b: StaticArray<f64>): void {
  const lu = dense;
  for (let k = 0; k < n; k++) {
    const p = unchecked(pivots[k]);
    if (p != k) {
      const swap = unchecked(b[k]);
      unchecked((b[k] = unchecked(b[p])));
      unchecked((b[p] = swap));
    }
  }
  for (let i = 1; i < n; i++) {
    const row = i * n;
    let sum = unchecked(b[i]);
    for (let j = 0; j < i; j++) sum -= unchecked(lu[row + j]) * unchecked(b[j]);
    unchecked((b[i] = sum));
  }
  for (let i = n - 1; i >= 0; i--) {
    const row = i * n;
    let sum = unchecked(b[i]);
    for (let j = i + 1; j < n; j++) sum -= unchecked(lu[row + j]) * unchecked(b[j]);
    unchecked((b[i] = sum / unchecked(lu[row + i])));
  }
}
