// The mass-action right-hand side y' = S·r(y), r_j = k_j·∏ y^p, and its analytic Jacobian written
// straight into the values of the sparsity pattern (one slot per possibly non-zero entry). The
// tables are filled by the JavaScript side (wasm-engine.ts); sums run in the same order as
// kinetic-system.ts's table-driven kernels, so both give the same numbers.

export let n: i32 = 0;
export let coefficients: StaticArray<f64> = [];
/** Factors of monomial j: positions factorStart[j] … factorStart[j + 1] − 1. */
let factorStart: StaticArray<i32> = [];
let factorVariable: StaticArray<i32> = [];
let factorPower: StaticArray<f64> = [];
/** y'_i = Σ variableChange[e]·r[variableRate[e]] over e in variableStart[i] … variableStart[i + 1] − 1. */
let variableStart: StaticArray<i32> = [];
let variableRate: StaticArray<i32> = [];
let variableChange: StaticArray<f64> = [];
/** The changes rate j makes: rateStart[j] … rateStart[j + 1] − 1. */
let rateStart: StaticArray<i32> = [];
let rateChange: StaticArray<f64> = [];
/** For each monomial, each of its factors, each of its changes in turn: the pattern slot of ∂f_i/∂y_a. */
let jacobianSlot: StaticArray<i32> = [];
/** The pattern in compressed rows: row i holds columns patternColumn[patternStart[i] …]. */
export let patternStart: StaticArray<i32> = [];
export let patternColumn: StaticArray<i32> = [];
/** ∂f/∂y at the pattern's slots. */
export let jacobian: StaticArray<f64> = [];
let rates: StaticArray<f64> = [];

export function configureSystem(
  size: i32,
  k: StaticArray<f64>,
  factorStarts: StaticArray<i32>,
  factorVariables: StaticArray<i32>,
  factorPowers: StaticArray<f64>,
  variableStarts: StaticArray<i32>,
  variableRates: StaticArray<i32>,
  variableChanges: StaticArray<f64>,
  rateStarts: StaticArray<i32>,
  rateVariables: StaticArray<i32>,
  rateChanges: StaticArray<f64>,
  patternStarts: StaticArray<i32>,
  patternColumns: StaticArray<i32>,
): void {
  n = size;
  coefficients = k;
  factorStart = factorStarts;
  factorVariable = factorVariables;
  factorPower = factorPowers;
  variableStart = variableStarts;
  variableRate = variableRates;
  variableChange = variableChanges;
  rateStart = rateStarts;
  rateChange = rateChanges;
  patternStart = patternStarts;
  patternColumn = patternColumns;
  jacobianSlot = jacobianSlots(rateVariables);
  jacobian = new StaticArray<f64>(patternColumns.length);
  rates = new StaticArray<f64>(k.length);
}

/** For each monomial, each of its factors, each of its changes in turn (evaluateJacobian's order): the slot it adds to. */
function jacobianSlots(rateVariable: StaticArray<i32>): StaticArray<i32> {
  let count = 0;
  for (let j = 0; j < coefficients.length; j++) {
    count += (unchecked(factorStart[j + 1]) - unchecked(factorStart[j])) * (unchecked(rateStart[j + 1]) - unchecked(rateStart[j]));
  }
  const slots = new StaticArray<i32>(count);
  let cursor = 0;
  for (let j = 0; j < coefficients.length; j++) {
    for (let f = unchecked(factorStart[j]); f < unchecked(factorStart[j + 1]); f++) {
      const column = unchecked(factorVariable[f]);
      for (let e = unchecked(rateStart[j]); e < unchecked(rateStart[j + 1]); e++) unchecked((slots[cursor++] = slotOf(unchecked(rateVariable[e]), column)));
    }
  }
  return slots;
}

/** The slot of ∂f_row/∂y_column among the pattern's values, −1 when the pattern has none. */
export function slotOf(row: i32, column: i32): i32 {
  let low = unchecked(patternStart[row]);
  let high = unchecked(patternStart[row + 1]) - 1;
  while (low <= high) {
    const middle = (low + high) >> 1;
    const found = unchecked(patternColumn[middle]);
    if (found == column) return middle;
    if (found < column) low = middle + 1;
    else high = middle - 1;
  }
  return -1;
}

@inline function power(value: f64, p: f64): f64 {
  return p == 1 ? value : p == 2 ? value * value : Math.pow(value, p);
}

/** f(y) into dy[offset …], so a stage vector of a flat stage array can be written in place. */
export function rhs(y: StaticArray<f64>, dy: StaticArray<f64>, offset: i32 = 0): void {
  const count = coefficients.length;
  for (let j = 0; j < count; j++) {
    let value = unchecked(coefficients[j]);
    const end = unchecked(factorStart[j + 1]);
    for (let f = unchecked(factorStart[j]); f < end; f++) value *= power(unchecked(y[unchecked(factorVariable[f])]), unchecked(factorPower[f]));
    unchecked((rates[j] = value));
  }
  for (let i = 0; i < n; i++) {
    let sum: f64 = 0;
    const end = unchecked(variableStart[i + 1]);
    for (let e = unchecked(variableStart[i]); e < end; e++) sum += unchecked(variableChange[e]) * unchecked(rates[unchecked(variableRate[e])]);
    unchecked((dy[offset + i] = sum));
  }
}

export function evaluateJacobian(y: StaticArray<f64>): void {
  const values = jacobian;
  for (let s = 0; s < values.length; s++) unchecked((values[s] = 0));
  const count = coefficients.length;
  let cursor = 0;
  for (let j = 0; j < count; j++) {
    const first = unchecked(factorStart[j]);
    const end = unchecked(factorStart[j + 1]);
    const k = unchecked(coefficients[j]);
    for (let f = first; f < end; f++) {
      const p = unchecked(factorPower[f]);
      let partial = p == 1 ? k : k * p * power(unchecked(y[unchecked(factorVariable[f])]), p - 1);
      for (let g = first; g < end; g++) if (g != f) partial *= power(unchecked(y[unchecked(factorVariable[g])]), unchecked(factorPower[g]));
      const changesEnd = unchecked(rateStart[j + 1]);
      for (let e = unchecked(rateStart[j]); e < changesEnd; e++) {
        const slot = unchecked(jacobianSlot[cursor++]);
        unchecked((values[slot] += unchecked(rateChange[e]) * partial));
      }
    }
  }
}
