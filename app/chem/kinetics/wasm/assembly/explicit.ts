// explicit-runge-kutta.ts for one first-same-as-last pair given as tables (Dormand–Prince 5(4)
// from dormand-prince.ts): the stage loop, the continuous extension, the stiffness test, and the
// shared step-size controller (step-size-controller.ts) with the pair's settings.

import { errorNorm, rtol } from "./norm";
import { n, rhs } from "./system";

const STIFF_VOTES = 15;
const CALM_VOTES = 6;
const ACCURACY_LIMITED_MULTIPLE: f64 = 30;
const NON_FINITE_SHRINK: f64 = 0.2;

let stageCount: i32 = 0;
let order: i32 = 5;
/** Rows of the tableau as non-zero terms: stage rows 1 … s − 2, then b, e and the dense row. */
let termStart: StaticArray<i32> = [];
let termIndex: StaticArray<i32> = [];
let termWeight: StaticArray<f64> = [];
let stiffnessThreshold: f64 = 0;
/** Controller settings: exponent, beta, predictive (0/1), safety, maxGrowth, maxShrink, errorFloor. */
let settings: StaticArray<f64> = [];

/** Stage vectors k_0 … k_{s−1}, n apart. */
let k: StaticArray<f64> = [];
export let yNew: StaticArray<f64> = [];
let stage: StaticArray<f64> = [];
let start: StaticArray<f64> = [];
let error: StaticArray<f64> = [];
/** The continuous extension's r1 … r5, n apart. */
let dense: StaticArray<f64> = [];
let haveFirstStage = false;
let lastH: f64 = 0;
let stiffVotes: i32 = 0;
let calmVotes: i32 = 0;
let previousError: f64 = 0;
let previousH: f64 = 0;
let rejectedLast = false;

export function configureExplicit(
  stages: i32,
  pairOrder: i32,
  stabilityBoundary: f64,
  termStarts: StaticArray<i32>,
  termIndices: StaticArray<i32>,
  termWeights: StaticArray<f64>,
  controller: StaticArray<f64>,
): void {
  stageCount = stages;
  order = pairOrder;
  termStart = termStarts;
  termIndex = termIndices;
  termWeight = termWeights;
  settings = controller;
  stiffnessThreshold = Math.min(stabilityBoundary, ACCURACY_LIMITED_MULTIPLE * Math.pow(rtol, 1 / <f64>pairOrder));
  k = new StaticArray<f64>(stages * n);
  yNew = new StaticArray<f64>(n);
  stage = new StaticArray<f64>(n);
  start = new StaticArray<f64>(n);
  error = new StaticArray<f64>(n);
  dense = new StaticArray<f64>(5 * n);
  haveFirstStage = false;
  lastH = 0;
  stiffVotes = 0;
  calmVotes = 0;
  previousError = unchecked(controller[6]);
  previousH = 0;
  rejectedLast = false;
}

export function explicitOrder(): i32 {
  return order;
}

/** out = base + scale·Σ w_j·k_j over the terms of tableau row `row` (weighted-sums.ts's scaledSum). */
function scaledSum(row: i32, out: StaticArray<f64>, base: StaticArray<f64> | null, scale: f64): void {
  const first = unchecked(termStart[row]);
  const count = unchecked(termStart[row + 1]) - first;
  if (count == 0) {
    for (let i = 0; i < n; i++) unchecked((out[i] = base ? unchecked(base[i]) : 0));
    return;
  }
  if (count == 1) {
    const weight = scale * unchecked(termWeight[first]);
    const offset = unchecked(termIndex[first]) * n;
    if (base) for (let i = 0; i < n; i++) unchecked((out[i] = unchecked(base[i]) + weight * unchecked(k[offset + i])));
    else for (let i = 0; i < n; i++) unchecked((out[i] = weight * unchecked(k[offset + i])));
    return;
  }
  const end = first + count;
  for (let i = 0; i < n; i++) {
    let sum = unchecked(termWeight[first]) * unchecked(k[unchecked(termIndex[first]) * n + i]);
    for (let t = first + 1; t < end; t++) sum += unchecked(termWeight[t]) * unchecked(k[unchecked(termIndex[t]) * n + i]);
    unchecked((out[i] = base ? unchecked(base[i]) + scale * sum : scale * sum));
  }
}

export function explicitStep(y: StaticArray<f64>, h: f64): f64 {
  for (let i = 0; i < n; i++) unchecked((start[i] = unchecked(y[i])));
  if (!haveFirstStage) {
    rhs(y, k, 0);
    haveFirstStage = true;
  }
  for (let i = 1; i < stageCount - 1; i++) {
    scaledSum(i - 1, stage, y, h);
    rhs(stage, k, i * n);
  }
  const rows = stageCount - 2;
  scaledSum(rows, yNew, y, h);
  rhs(yNew, k, (stageCount - 1) * n);
  scaledSum(rows + 1, error, null, h);
  lastH = h;
  return errorNorm(error, y, yNew);
}

export function explicitAccept(): void {
  const h = lastH;
  const last = (stageCount - 1) * n;
  scaledSum(stageCount, error, null, h);
  for (let i = 0; i < n; i++) {
    const difference = unchecked(yNew[i]) - unchecked(start[i]);
    const spline = h * unchecked(k[i]) - difference;
    unchecked((dense[i] = unchecked(start[i])));
    unchecked((dense[n + i] = difference));
    unchecked((dense[2 * n + i] = spline));
    unchecked((dense[3 * n + i] = difference - h * unchecked(k[last + i]) - spline));
    unchecked((dense[4 * n + i] = unchecked(error[i])));
  }
  voteOnStiffness();
  for (let i = 0; i < n; i++) unchecked((k[i] = unchecked(k[last + i])));
}

export function explicitInterpolate(theta: f64, out: StaticArray<f64>): void {
  const rest = 1 - theta;
  for (let i = 0; i < n; i++) {
    const r1 = unchecked(dense[i]);
    const r2 = unchecked(dense[n + i]);
    const r3 = unchecked(dense[2 * n + i]);
    const r4 = unchecked(dense[3 * n + i]);
    const r5 = unchecked(dense[4 * n + i]);
    unchecked((out[i] = r1 + theta * (r2 + rest * (r3 + theta * (r4 + rest * r5)))));
  }
}

export function explicitInvalidate(): void {
  haveFirstStage = false;
}

export function explicitStiff(): bool {
  return stiffVotes >= STIFF_VOTES;
}

function voteOnStiffness(): void {
  const beforeLast = (stageCount - 2) * n;
  const last = (stageCount - 1) * n;
  let numerator: f64 = 0;
  let denominator: f64 = 0;
  for (let i = 0; i < n; i++) {
    const slope = unchecked(k[last + i]) - unchecked(k[beforeLast + i]);
    const distance = unchecked(yNew[i]) - unchecked(stage[i]);
    numerator += slope * slope;
    denominator += distance * distance;
  }
  const hLambda = denominator > 0 ? lastH * Math.sqrt(numerator / denominator) : 0;
  if (hLambda > stiffnessThreshold) {
    calmVotes = 0;
    stiffVotes++;
  } else if (++calmVotes == CALM_VOTES) {
    stiffVotes = 0;
  }
}

/** step-size-controller.ts's `next`, with the pair's settings. */
export function explicitNext(h: f64, err: f64, accepted: bool): f64 {
  if (!isFinite(err)) {
    rejectedLast = true;
    return h * NON_FINITE_SHRINK;
  }
  const exponent = unchecked(settings[0]);
  const beta = unchecked(settings[1]);
  const predictive = unchecked(settings[2]) != 0;
  const safety = unchecked(settings[3]);
  const errorFloor = unchecked(settings[6]);
  const divisorFromError = Math.pow(err, exponent);
  if (!accepted) {
    rejectedLast = true;
    return h / bounded(divisorFromError / safety);
  }
  let divisor = bounded(divisorFromError / Math.pow(previousError, beta) / safety);
  if (predictive && previousH > 0) {
    const predicted = ((previousH / h) * Math.pow((err * err) / previousError, exponent)) / safety;
    divisor = Math.max(divisor, bounded(predicted));
  }
  previousError = Math.max(errorFloor, err);
  previousH = h;
  const next = h / divisor;
  const capped = rejectedLast ? Math.min(next, h) : next;
  rejectedLast = false;
  return capped;
}

function bounded(divisor: f64): f64 {
  return Math.max(1 / unchecked(settings[4]), Math.min(unchecked(settings[5]), divisor));
}
