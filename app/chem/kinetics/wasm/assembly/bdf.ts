// bdf.ts ported: the variable-order NDF/BDF in backward-difference form with quasi-constant step
// size, modified Newton with the Jacobian and the LU kept across steps, and step size and order
// chosen together. The coefficient tables (γ, α, error constants) come from bdf.ts; the constants
// below are bdf.ts's, with the same names.

import { errorNorm, rtol } from "./norm";
import { evaluateJacobian, n, rhs } from "./system";
import { factor, solve } from "./lu";

const MAX_ORDER = 5;
const SIZE = MAX_ORDER + 1;
const NEWTON_MAX_ITERATIONS = 4;
const INITIAL_RATE: f64 = 0.7;
const LU_REUSE_RATIO: f64 = 0.3;
const MAX_GROWTH: f64 = 10;
const MIN_FACTOR: f64 = 0.2;
const MIN_GROWTH: f64 = 1.2;
const NEWTON_FAILURE_SHRINK: f64 = 0.25;
const UNDERSHOOT_FRACTION: f64 = 1e-8;
const ROUND_OFF: f64 = 100 * f64.EPSILON;

let gamma: StaticArray<f64> = [];
let alpha: StaticArray<f64> = [];
let errorConstant: StaticArray<f64> = [];
let nonNegative = false;
let newtonTolerance: f64 = 0;
export let jacobians: i32 = 0;
/** D[0 … MAX_ORDER + 2], n apart, scaled to the step historyH. */
let D: StaticArray<f64> = [];
let historyH: f64 = 0;
export let currentOrder: i32 = 1;
let nextOrder: i32 = 1;
let equalSteps: i32 = 0;
export let yNew: StaticArray<f64> = [];
let predicted: StaticArray<f64> = [];
let psi: StaticArray<f64> = [];
let correction: StaticArray<f64> = [];
let f: StaticArray<f64> = [];
let increment: StaticArray<f64> = [];
let scratch: StaticArray<f64> = [];
/** D[0 … order] of the last accepted step, n apart. */
let interpolant: StaticArray<f64> = [];
let interpolantOrder: i32 = 0;
let factoredC: f64 = 0;
let jacobianFresh = false;
let rate: f64 = INITIAL_RATE;
let iterations: i32 = 0;
let newtonFailed = false;
let stateChanged = false;
// Scratch of `rescale`: R(ρ), U = R(1), R·U and one component's differences. Allocated per run,
// like every array here: the engine's memory is reset between runs.
let ratioMatrix: StaticArray<f64> = [];
let unitRatioMatrix: StaticArray<f64> = [];
let rescaling: StaticArray<f64> = [];
let column: StaticArray<f64> = [];

export function configureBdf(gammas: StaticArray<f64>, alphas: StaticArray<f64>, errorConstants: StaticArray<f64>, clipsNegatives: bool): void {
  gamma = gammas;
  alpha = alphas;
  errorConstant = errorConstants;
  nonNegative = clipsNegatives;
}

/** A fresh BDF (the switch from the explicit phase, or a run that starts stiff). */
export function startBdf(): void {
  newtonTolerance = Math.max((10 * f64.EPSILON) / rtol, Math.min(0.03, Math.sqrt(rtol)));
  ratioMatrix = new StaticArray<f64>(SIZE * SIZE);
  unitRatioMatrix = new StaticArray<f64>(SIZE * SIZE);
  rescaling = new StaticArray<f64>(SIZE * SIZE);
  column = new StaticArray<f64>(SIZE);
  differenceMatrix(1, unitRatioMatrix);
  jacobians = 0;
  D = new StaticArray<f64>((MAX_ORDER + 3) * n);
  interpolant = new StaticArray<f64>((MAX_ORDER + 1) * n);
  yNew = new StaticArray<f64>(n);
  predicted = new StaticArray<f64>(n);
  psi = new StaticArray<f64>(n);
  correction = new StaticArray<f64>(n);
  f = new StaticArray<f64>(n);
  increment = new StaticArray<f64>(n);
  scratch = new StaticArray<f64>(n);
  historyH = 0;
  currentOrder = nextOrder = 1;
  equalSteps = 0;
  interpolantOrder = 0;
  factoredC = 0;
  jacobianFresh = false;
  rate = INITIAL_RATE;
  iterations = 0;
  newtonFailed = false;
  stateChanged = false;
}

export function bdfStep(y: StaticArray<f64>, h: f64): f64 {
  if (historyH == 0) restart(y, h);
  else if (stateChanged) adopt(y, h);
  stateChanged = false;
  if (h != historyH) rescale(h / historyH, h);
  predict();
  const c = h / unchecked(alpha[currentOrder]);
  let converged = correct(c);
  if (!converged && !jacobianFresh) {
    newJacobian(predicted);
    converged = correct(c);
  }
  if (!converged) {
    newtonFailed = true;
    return Infinity;
  }
  const constant = unchecked(errorConstant[currentOrder]);
  for (let i = 0; i < n; i++) unchecked((scratch[i] = constant * unchecked(correction[i])));
  const error = errorNorm(scratch, y, yNew);
  return nonNegative ? Math.max(error, undershoot(y)) : error;
}

function undershoot(y: StaticArray<f64>): f64 {
  let size: f64 = 0;
  for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(unchecked(yNew[i])));
  const floor = -ROUND_OFF * size;
  let any = false;
  for (let i = 0; i < n; i++) {
    const value = unchecked(yNew[i]);
    unchecked((scratch[i] = value < floor ? floor - value : 0));
    any = any || value < floor;
  }
  return any ? errorNorm(scratch, y, yNew) / UNDERSHOOT_FRACTION : 0;
}

export function bdfNext(h: f64, error: f64, accepted: bool): f64 {
  if (newtonFailed) {
    newtonFailed = false;
    return h * NEWTON_FAILURE_SHRINK;
  }
  const k = currentOrder;
  const safety = (0.9 * <f64>(2 * NEWTON_MAX_ITERATIONS + 1)) / <f64>(2 * NEWTON_MAX_ITERATIONS + iterations);
  if (!accepted) return h * Math.max(MIN_FACTOR, safety * Math.pow(error, -1 / <f64>(k + 1)));
  nextOrder = k;
  if (equalSteps + 1 < k + 1) return h;
  let best = Math.pow(error, -1 / <f64>(k + 1));
  let order = k;
  if (k > 1) {
    const constant = unchecked(errorConstant[k - 1]);
    const row = k * n;
    for (let i = 0; i < n; i++) unchecked((scratch[i] = constant * (unchecked(D[row + i]) + unchecked(correction[i]))));
    const lower = Math.pow(errorNorm(scratch, yNew, yNew), -1 / <f64>k);
    if (lower > best) {
      best = lower;
      order = k - 1;
    }
  }
  if (k < MAX_ORDER) {
    const constant = unchecked(errorConstant[k + 1]);
    const row = (k + 1) * n;
    for (let i = 0; i < n; i++) unchecked((scratch[i] = constant * (unchecked(correction[i]) - unchecked(D[row + i]))));
    const higher = Math.pow(errorNorm(scratch, yNew, yNew), -1 / <f64>(k + 2));
    if (higher > best) {
      best = higher;
      order = k + 1;
    }
  }
  const growth = Math.min(MAX_GROWTH, safety * best);
  if (order == k && growth >= 1 && growth < MIN_GROWTH) return h;
  nextOrder = order;
  return h * growth;
}

export function bdfAccept(): void {
  const k = currentOrder;
  const above = (k + 1) * n;
  const top = (k + 2) * n;
  for (let i = 0; i < n; i++) unchecked((D[top + i] = unchecked(correction[i]) - unchecked(D[above + i])));
  for (let i = 0; i < n; i++) unchecked((D[above + i] = unchecked(correction[i])));
  for (let j = k; j >= 0; j--) {
    const row = j * n;
    for (let i = 0; i < n; i++) unchecked((D[row + i] += unchecked(D[row + n + i])));
  }
  for (let i = 0; i < (k + 1) * n; i++) unchecked((interpolant[i] = unchecked(D[i])));
  interpolantOrder = k;
  equalSteps++;
  if (nextOrder != k) {
    currentOrder = nextOrder;
    equalSteps = 0;
  }
  jacobianFresh = false;
}

export function bdfInterpolate(theta: f64, out: StaticArray<f64>): void {
  const x = theta - 1;
  for (let i = 0; i < n; i++) unchecked((out[i] = unchecked(interpolant[i])));
  let weight: f64 = 1;
  for (let j = 1; j <= interpolantOrder; j++) {
    weight *= (x + <f64>j - 1) / <f64>j;
    const row = j * n;
    for (let i = 0; i < n; i++) unchecked((out[i] += weight * unchecked(interpolant[row + i])));
  }
}

export function bdfInvalidate(): void {
  stateChanged = true;
}

function restart(y: StaticArray<f64>, h: f64): void {
  for (let i = 0; i < D.length; i++) unchecked((D[i] = 0));
  for (let i = 0; i < n; i++) unchecked((D[i] = unchecked(y[i])));
  rhs(y, f);
  for (let i = 0; i < n; i++) unchecked((D[n + i] = h * unchecked(f[i])));
  historyH = h;
  currentOrder = nextOrder = 1;
  equalSteps = 0;
  newJacobian(y);
}

function adopt(y: StaticArray<f64>, h: f64): void {
  for (let i = 0; i < n; i++) unchecked((scratch[i] = unchecked(y[i]) - unchecked(D[i])));
  // D[0] is D's first n entries, and errorNorm reads as many as the error has.
  const norm = errorNorm(scratch, y, D);
  if (norm <= 1) for (let i = 0; i < n; i++) unchecked((D[i] = unchecked(y[i])));
  else restart(y, h);
}

/** D[0 … k] ← (R·U)ᵀ·D[0 … k], from step historyH to step h. */
function rescale(ratio: f64, h: f64): void {
  const k = currentOrder;
  differenceMatrix(ratio, ratioMatrix);
  for (let m = 0; m <= k; m++) {
    for (let j = 0; j <= k; j++) {
      let sum: f64 = 0;
      for (let l = 0; l <= k; l++) sum += unchecked(ratioMatrix[m * SIZE + l]) * unchecked(unitRatioMatrix[l * SIZE + j]);
      unchecked((rescaling[m * SIZE + j] = sum));
    }
  }
  for (let i = 0; i < n; i++) {
    for (let m = 0; m <= k; m++) unchecked((column[m] = unchecked(D[m * n + i])));
    for (let j = 0; j <= k; j++) {
      let sum: f64 = 0;
      for (let m = 0; m <= k; m++) sum += unchecked(rescaling[m * SIZE + j]) * unchecked(column[m]);
      unchecked((D[j * n + i] = sum));
    }
  }
  historyH = h;
  equalSteps = 0;
}

function predict(): void {
  const k = currentOrder;
  const a = unchecked(alpha[k]);
  for (let i = 0; i < n; i++) {
    unchecked((predicted[i] = unchecked(D[i])));
    unchecked((psi[i] = 0));
  }
  for (let j = 1; j <= k; j++) {
    const row = j * n;
    const weight = unchecked(gamma[j]) / a;
    for (let i = 0; i < n; i++) {
      const dj = unchecked(D[row + i]);
      unchecked((predicted[i] += dj));
      unchecked((psi[i] += weight * dj));
    }
  }
}

function correct(c: f64): bool {
  if (factoredC == 0 || Math.abs(c / factoredC - 1) > LU_REUSE_RATIO) {
    if (!factor(1 / c)) return false;
    factoredC = c;
    rate = INITIAL_RATE;
  }
  const y = yNew;
  const cLu = factoredC;
  const damping = 2 / (1 + c / cLu);
  for (let i = 0; i < n; i++) {
    unchecked((y[i] = unchecked(predicted[i])));
    unchecked((correction[i] = 0));
  }
  let previousNorm: f64 = 0;
  for (let iteration = 0; iteration < NEWTON_MAX_ITERATIONS; iteration++) {
    rhs(y, f);
    for (let i = 0; i < n; i++) unchecked((increment[i] = (c * unchecked(f[i]) - unchecked(psi[i]) - unchecked(correction[i])) / cLu));
    solve(increment);
    if (damping != 1) for (let i = 0; i < n; i++) unchecked((increment[i] *= damping));
    const norm = errorNorm(increment, predicted, predicted);
    if (!isFinite(norm)) return false;
    let observedRate = rate;
    if (iteration > 0) {
      const observed = norm / previousNorm;
      if (observed >= 1 || (Math.pow(observed, <f64>(NEWTON_MAX_ITERATIONS - iteration)) / (1 - observed)) * norm > newtonTolerance) return false;
      observedRate = rate = Math.max(0.2 * rate, observed);
    }
    for (let i = 0; i < n; i++) {
      const step = unchecked(increment[i]);
      unchecked((y[i] += step));
      unchecked((correction[i] += step));
    }
    if (norm == 0 || (observedRate < 1 && (observedRate / (1 - observedRate)) * norm < newtonTolerance)) {
      iterations = iteration + 1;
      return true;
    }
    previousNorm = norm;
  }
  return false;
}

function newJacobian(y: StaticArray<f64>): void {
  evaluateJacobian(y);
  jacobians++;
  jacobianFresh = true;
  factoredC = 0;
}

/** Shampine & Reichelt's R(ρ), R[i][j] = Π_{m=1..i} (m − 1 − ρ·j)/m, R[0][j] = 1. */
function differenceMatrix(ratio: f64, out: StaticArray<f64>): void {
  for (let j = 0; j < SIZE; j++) unchecked((out[j] = 1));
  for (let i = 1; i < SIZE; i++) {
    for (let j = 0; j < SIZE; j++) unchecked((out[i * SIZE + j] = (unchecked(out[(i - 1) * SIZE + j]) * (<f64>(i - 1) - ratio * <f64>j)) / <f64>i));
  }
}
