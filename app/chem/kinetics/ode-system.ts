// The compiled form every integrator works on: an autonomous system y' = f(y) with a dense
// Jacobian. Built once per model (mechanism or polynomial ODE), evaluated many thousand times.

export interface OdeSystem {
  /** Variable names, in the order of the state vector. */
  readonly names: string[];
  readonly initial: Float64Array;
  /** Concentrations: the output clips tiny negative round-off to 0 (see simulate.ts). */
  readonly nonNegative: boolean;
  /** Writes f(y) into dy. */
  rhs(y: Float64Array, dy: Float64Array): void;
  /** Writes ∂f/∂y into jacobian (row-major, n×n, every entry). */
  jacobian(y: Float64Array, jacobian: Float64Array): void;
  /** Per row i, the columns j where ∂f_i/∂y_j can be non-zero; absent means dense. */
  readonly sparsity?: readonly (readonly number[])[];
}

/**
 * Forward-difference Jacobian columns for the given variables, written into a row-major n×n matrix
 * (other columns untouched). Used where no analytic derivative exists (custom rate laws, the
 * variational system's own Jacobian).
 */
export function finiteDifferenceColumns(
  rhs: (y: Float64Array, dy: Float64Array) => void,
  y: Float64Array,
  f0: Float64Array,
  columns: ArrayLike<number>,
  jacobian: Float64Array,
  scratch: { state: Float64Array; value: Float64Array },
): void {
  const n = y.length;
  scratch.state.set(y);
  for (let c = 0; c < columns.length; c++) {
    const j = columns[c];
    // √ε scaled by the variable's size balances truncation against round-off.
    const delta = Math.sqrt(Number.EPSILON) * Math.max(Math.abs(y[j]), 1e-5);
    scratch.state[j] = y[j] + delta;
    rhs(scratch.state, scratch.value);
    scratch.state[j] = y[j];
    for (let i = 0; i < n; i++) jacobian[i * n + j] = (scratch.value[i] - f0[i]) / delta;
  }
}
