// LU factorisation of W = s·I − J for a Jacobian J with a fixed sparsity pattern, the matrix a
// Rosenbrock step solves with. Reaction networks couple each species to few others, so after a
// minimum-degree ordering the factors stay sparse and a step costs far less than O(n³). The
// ordering and the fill pattern are computed once per sparsity pattern (cached); each
// factorisation only redoes the numbers.
// Minimum degree leaves a dense clique for last; that tail is factored as a dense block (the
// Schur complement, contiguous in memory), which is several times faster per operation than
// indexed sparse updates. Pivots are taken on the diagonal in that order (W is diagonally
// dominated for small steps); when a pivot is too small relative to its row, `factor` reports
// failure and the caller falls back to dense partial pivoting.

const PIVOT_THRESHOLD = 1e-10;

/**
 * What the numbers do not change: the elimination order, the fill pattern of L and U, where each
 * entry of J goes, and the dense tail. Computed once per sparsity pattern (that is, once per
 * compiled mechanism) and shared by every solver built on it — a sweep or a second integrator
 * over the same system only redoes the numbers.
 */
interface SymbolicFactorization {
  n: number;
  /** order[p] = the original index at elimination position p. */
  order: Int32Array;
  /** Per permuted row: the original-matrix positions (row·n + column) to read, and where they go. */
  sourceStart: Int32Array;
  sourceIndex: Int32Array;
  sourceColumn: Int32Array;
  /** Strictly lower (L) and strictly upper (U) parts in compressed rows, permuted indices. */
  lowerStart: Int32Array;
  lowerColumn: Int32Array;
  upperStart: Int32Array;
  upperColumn: Int32Array;
  diagonalSource: Int32Array;
  /** Positions from `tailStart` on form a clique, held as a dense block. */
  tailStart: number;
}

const symbolicCache = new WeakMap<readonly (readonly number[])[], SymbolicFactorization>();

function symbolicFactorization(pattern: readonly (readonly number[])[]): SymbolicFactorization {
  const cached = symbolicCache.get(pattern);
  if (cached) return cached;
  const n = pattern.length;
  const { order, upper } = minimumDegreeOrder(pattern);
  const position = new Int32Array(n);
  order.forEach((original, p) => (position[original] = p));

  // Fill pattern: U row p = the later neighbours of p when it was eliminated; L is its transpose.
  // Rows of the dense tail keep only their sparse part (columns before the tail) in these lists.
  let tailStart = n;
  while (tailStart > 0 && upper[tailStart - 1].length === n - tailStart) tailStart--;
  const lowerLists: number[][] = Array.from({ length: n }, () => []);
  const upperLists = upper.map((list, p) => (p >= tailStart ? [] : list.sort((a, b) => a - b)));
  upperLists.forEach((list, p) => list.forEach((q) => lowerLists[q].push(p)));
  lowerLists.forEach((list) => list.sort((a, b) => a - b));
  const [lowerStart, lowerColumn] = compress(lowerLists);
  const [upperStart, upperColumn] = compress(upperLists);

  const sources: number[][] = Array.from({ length: n }, () => []);
  const columns: number[][] = Array.from({ length: n }, () => []);
  pattern.forEach((row, i) => {
    for (const j of new Set(row)) {
      if (j === i) continue;
      sources[position[i]].push(i * n + j);
      columns[position[i]].push(position[j]);
    }
  });
  const [sourceStart, sourceIndex] = compress(sources);
  const symbolic: SymbolicFactorization = {
    n,
    order,
    sourceStart,
    sourceIndex,
    sourceColumn: Int32Array.from(columns.flat()),
    lowerStart,
    lowerColumn,
    upperStart,
    upperColumn,
    diagonalSource: Int32Array.from(order, (original) => original * n + original),
    tailStart,
  };
  symbolicCache.set(pattern, symbolic);
  return symbolic;
}

export class SparseShiftedLu {
  readonly n: number;
  private readonly order: Int32Array;
  private readonly sourceStart: Int32Array;
  private readonly sourceIndex: Int32Array;
  private readonly sourceColumn: Int32Array;
  private readonly lowerStart: Int32Array;
  private readonly lowerColumn: Int32Array;
  private readonly lowerValue: Float64Array;
  private readonly upperStart: Int32Array;
  private readonly upperColumn: Int32Array;
  private readonly upperValue: Float64Array;
  private readonly diagonal: Float64Array;
  private readonly work: Float64Array;
  private readonly diagonalSource: Int32Array;
  private readonly tailStart: number;
  /** The dense tail, m×m. */
  private readonly tail: Float64Array;
  private readonly rowSize: Float64Array;

  /** `pattern[i]`: the columns j with J[i][j] possibly non-zero (the same array object finds the cached ordering). */
  constructor(pattern: readonly (readonly number[])[]) {
    const symbolic = symbolicFactorization(pattern);
    const { n, tailStart } = symbolic;
    this.n = n;
    this.order = symbolic.order;
    this.sourceStart = symbolic.sourceStart;
    this.sourceIndex = symbolic.sourceIndex;
    this.sourceColumn = symbolic.sourceColumn;
    this.lowerStart = symbolic.lowerStart;
    this.lowerColumn = symbolic.lowerColumn;
    this.upperStart = symbolic.upperStart;
    this.upperColumn = symbolic.upperColumn;
    this.diagonalSource = symbolic.diagonalSource;
    this.tailStart = tailStart;
    this.tail = new Float64Array((n - tailStart) * (n - tailStart));
    this.rowSize = new Float64Array(n);
    this.lowerValue = new Float64Array(this.lowerColumn.length);
    this.upperValue = new Float64Array(this.upperColumn.length);
    this.diagonal = new Float64Array(n);
    this.work = new Float64Array(n);
  }

  /** Stored entries of the factors (sparse part, dense tail, diagonal) against n² for dense storage. */
  get fillRatio(): number {
    const m = this.n - this.tailStart;
    return (this.lowerColumn.length + this.upperColumn.length + m * m + this.tailStart) / (this.n * this.n);
  }

  /** Factors s·I − J, J dense row-major; false when a diagonal pivot is unusably small. */
  factor(shift: number, jacobian: Float64Array): boolean {
    const { n, work, lowerStart, lowerColumn, lowerValue, upperStart, upperColumn, upperValue, diagonal, tailStart, tail, rowSize } = this;
    const m = n - tailStart;
    for (let p = 0; p < n; p++) {
      let size = Math.abs((work[p] = shift - jacobian[this.diagonalSource[p]]));
      for (let e = this.sourceStart[p]; e < this.sourceStart[p + 1]; e++) {
        const value = -jacobian[this.sourceIndex[e]];
        work[this.sourceColumn[e]] = value;
        size = Math.max(size, Math.abs(value));
      }
      rowSize[p] = size;
      const lowerEnd = lowerStart[p + 1];
      for (let e = lowerStart[p]; e < lowerEnd; e++) {
        const k = lowerColumn[e];
        const multiplier = work[k] / diagonal[k];
        work[k] = 0;
        lowerValue[e] = multiplier;
        if (multiplier === 0) continue;
        const upperEnd = upperStart[k + 1];
        for (let f = upperStart[k]; f < upperEnd; f++) work[upperColumn[f]] -= multiplier * upperValue[f];
      }
      if (p >= tailStart) {
        // The tail row after the sparse eliminations: a row of the Schur complement.
        const row = (p - tailStart) * m;
        for (let c = 0; c < m; c++) {
          tail[row + c] = work[tailStart + c];
          work[tailStart + c] = 0;
        }
        continue;
      }
      const pivot = work[p];
      work[p] = 0;
      if (!(Math.abs(pivot) > PIVOT_THRESHOLD * size)) {
        work.fill(0);
        return false;
      }
      diagonal[p] = pivot;
      for (let f = upperStart[p]; f < upperStart[p + 1]; f++) {
        upperValue[f] = work[upperColumn[f]];
        work[upperColumn[f]] = 0;
      }
    }
    // Dense LU of the tail in place, diagonal pivots (unit L below, U on and above the diagonal).
    for (let k = 0; k < m; k++) {
      const pivot = tail[k * m + k];
      if (!(Math.abs(pivot) > PIVOT_THRESHOLD * rowSize[tailStart + k])) return false;
      diagonal[tailStart + k] = pivot;
      const inverse = 1 / pivot;
      for (let i = k + 1; i < m; i++) {
        const rowI = i * m;
        const multiplier = (tail[rowI + k] *= inverse);
        if (multiplier === 0) continue;
        const rowK = k * m;
        for (let j = k + 1; j < m; j++) tail[rowI + j] -= multiplier * tail[rowK + j];
      }
    }
    return true;
  }

  /** Solves (s·I − J)·x = b in place with the last factors. */
  solve(b: Float64Array): void {
    const { n, order, work: x, lowerStart, lowerColumn, lowerValue, upperStart, upperColumn, upperValue, diagonal, tailStart, tail } = this;
    const m = n - tailStart;
    for (let p = 0; p < n; p++) {
      let sum = b[order[p]];
      for (let e = lowerStart[p]; e < lowerStart[p + 1]; e++) sum -= lowerValue[e] * x[lowerColumn[e]];
      if (p >= tailStart) {
        const row = (p - tailStart) * m;
        for (let c = 0; c < p - tailStart; c++) sum -= tail[row + c] * x[tailStart + c];
      }
      x[p] = sum;
    }
    for (let p = n - 1; p >= tailStart; p--) {
      const row = (p - tailStart) * m;
      let sum = x[p];
      for (let c = p - tailStart + 1; c < m; c++) sum -= tail[row + c] * x[tailStart + c];
      x[p] = sum / diagonal[p];
    }
    for (let p = tailStart - 1; p >= 0; p--) {
      let sum = x[p];
      for (let f = upperStart[p]; f < upperStart[p + 1]; f++) sum -= upperValue[f] * x[upperColumn[f]];
      x[p] = sum / diagonal[p];
    }
    for (let p = 0; p < n; p++) {
      b[order[p]] = x[p];
      x[p] = 0;
    }
  }
}

/**
 * Greedy minimum-degree ordering on the symmetrised pattern, recording for each position the later
 * positions it is joined to when eliminated (its row of U, fill included). Ties go to the lowest
 * index. The elimination graph is kept as plain neighbour lists with a stamp array against
 * duplicates: hashing every fill edge into a Set made this ordering most of a cold simulation's
 * set-up on a network with a large dense tail.
 */
function minimumDegreeOrder(pattern: readonly (readonly number[])[]): { order: Int32Array; upper: number[][] } {
  const n = pattern.length;
  const symmetric = Array.from({ length: n }, () => new Set<number>());
  pattern.forEach((row, i) => {
    for (const j of row) {
      if (j === i) continue;
      symmetric[i].add(j);
      symmetric[j].add(i);
    }
  });
  const neighbours = symmetric.map((set) => [...set]);
  const stamp = new Int32Array(n);
  let currentStamp = 0;
  const eliminated = new Uint8Array(n);
  const order = new Int32Array(n);
  const joined: number[][] = [];
  for (let p = 0; p < n; p++) {
    let best = -1;
    for (let v = 0; v < n; v++) if (!eliminated[v] && (best < 0 || neighbours[v].length < neighbours[best].length)) best = v;
    if (neighbours[best].length === n - p - 1) {
      // The least degree is that of a clique: every node left is joined to every other, and stays
      // so as they go, all with one degree; so they go in index order, each joined to those after.
      const rest: number[] = [];
      for (let v = 0; v < n; v++) if (!eliminated[v]) rest.push(v);
      rest.forEach((v, q) => {
        order[p + q] = v;
        joined.push(rest.slice(q + 1));
      });
      break;
    }
    order[p] = best;
    eliminated[best] = 1;
    const around = neighbours[best];
    joined.push(around);
    // Each neighbour loses `best` and gains the others: they form a clique once it is gone.
    for (const a of around) {
      const list = neighbours[a];
      currentStamp++;
      stamp[a] = currentStamp;
      for (const v of list) stamp[v] = currentStamp;
      const at = list.indexOf(best);
      list[at] = list[list.length - 1];
      list.pop();
      for (const b of around) if (stamp[b] !== currentStamp) list.push(b);
    }
  }
  const position = new Int32Array(n);
  order.forEach((original, p) => (position[original] = p));
  return { order, upper: joined.map((around) => around.map((v) => position[v])) };
}

function compress(lists: number[][]): [Int32Array, Int32Array] {
  const start = new Int32Array(lists.length + 1);
  lists.forEach((list, i) => (start[i + 1] = start[i] + list.length));
  return [start, Int32Array.from(lists.flat())];
}
