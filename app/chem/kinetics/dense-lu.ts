// LU factorisation with partial pivoting of a dense row-major matrix, in place. The stiff stepper
// factors (I/(h·γ) − J) once per step and solves with it several times, so factor and solve are
// separate. Dense is the right choice up to a few hundred species: O(n³/3) in tight typed loops.

export class DenseLu {
  readonly n: number;
  /** Row-major n×n storage; overwritten with L (unit lower, below the diagonal) and U. */
  readonly lu: Float64Array;
  private readonly pivots: Int32Array;

  constructor(n: number) {
    this.n = n;
    this.lu = new Float64Array(n * n);
    this.pivots = new Int32Array(n);
  }

  /** Factors s·I − J (J dense row-major), the matrix of a Rosenbrock step. */
  factorShifted(shift: number, jacobian: Float64Array): boolean {
    const { n, lu } = this;
    for (let i = 0; i < n * n; i++) lu[i] = -jacobian[i];
    for (let i = 0; i < n; i++) lu[i * n + i] += shift;
    return this.factor();
  }

  /** Factors the matrix currently held in `lu`. Returns false when it is singular. */
  factor(): boolean {
    const { n, lu, pivots } = this;
    for (let k = 0; k < n; k++) {
      let pivotRow = k;
      let pivotSize = Math.abs(lu[k * n + k]);
      for (let i = k + 1; i < n; i++) {
        const size = Math.abs(lu[i * n + k]);
        if (size > pivotSize) {
          pivotSize = size;
          pivotRow = i;
        }
      }
      pivots[k] = pivotRow;
      if (pivotSize === 0 || !Number.isFinite(pivotSize)) return false;
      if (pivotRow !== k) {
        const a = k * n;
        const b = pivotRow * n;
        for (let j = 0; j < n; j++) {
          const swap = lu[a + j];
          lu[a + j] = lu[b + j];
          lu[b + j] = swap;
        }
      }
      const rowK = k * n;
      const inversePivot = 1 / lu[rowK + k];
      for (let i = k + 1; i < n; i++) {
        const rowI = i * n;
        const factor = lu[rowI + k] * inversePivot;
        if (factor === 0) continue; // chemical Jacobians are sparse: skip empty eliminations
        lu[rowI + k] = factor;
        for (let j = k + 1; j < n; j++) lu[rowI + j] -= factor * lu[rowK + j];
      }
    }
    return true;
  }

  /** Solves A·x = b in place (b becomes x), with the factors from the last `factor()`. */
  solve(b: Float64Array): void {
    const { n, lu, pivots } = this;
    for (let k = 0; k < n; k++) {
      const p = pivots[k];
      if (p !== k) {
        const swap = b[k];
        b[k] = b[p];
        b[p] = swap;
      }
    }
    for (let i = 1; i < n; i++) {
      const row = i * n;
      let sum = b[i];
      for (let j = 0; j < i; j++) sum -= lu[row + j] * b[j];
      b[i] = sum;
    }
    for (let i = n - 1; i >= 0; i--) {
      const row = i * n;
      let sum = b[i];
      for (let j = i + 1; j < n; j++) sum -= lu[row + j] * b[j];
      b[i] = sum / lu[row + i];
    }
  }
}
