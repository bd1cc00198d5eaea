// The linear solver every implicit method shares: factors s·I − J for the system's Jacobian J and
// solves with the factors. Sparse (ordering and fill computed once per system) when the pattern
// allows, dense partial pivoting otherwise or when a sparse diagonal pivot is unusably small.

import { DenseLu } from "./dense-lu";
import type { OdeSystem } from "./ode-system";
import { SparseShiftedLu } from "./sparse-lu";

/** Below this size dense LU is as fast; above this fill the sparse factors stop paying off. */
export const SPARSE_MIN_SIZE = 40;
export const SPARSE_MAX_FILL = 0.3;

interface Factors {
  solve(b: Float64Array): void;
}

export class ShiftedLu {
  /** Numeric factorisations done so far (the symbolic one is done once, in the constructor). */
  factorizations = 0;
  private readonly sparse: SparseShiftedLu | null;
  private dense: DenseLu | null = null;
  private factors: Factors | null = null;

  constructor(private readonly system: OdeSystem) {
    this.sparse = sparseSolver(system);
  }

  /** Factors s·I − J (J dense row-major); false when the matrix is numerically singular. */
  factor(shift: number, jacobian: Float64Array): boolean {
    this.factorizations++;
    if (this.sparse?.factor(shift, jacobian)) {
      this.factors = this.sparse;
      return true;
    }
    this.dense ??= new DenseLu(this.system.names.length);
    this.factors = this.dense.factorShifted(shift, jacobian) ? this.dense : null;
    return this.factors !== null;
  }

  /** Solves (s·I − J)·x = b in place with the last successful factors. */
  solve(b: Float64Array): void {
    if (!this.factors) throw new Error("ShiftedLu.solve before a successful factor");
    this.factors.solve(b);
  }
}

function sparseSolver(system: OdeSystem): SparseShiftedLu | null {
  if (!system.sparsity || system.names.length < SPARSE_MIN_SIZE) return null;
  const solver = new SparseShiftedLu(system.sparsity);
  return solver.fillRatio <= SPARSE_MAX_FILL ? solver : null;
}
