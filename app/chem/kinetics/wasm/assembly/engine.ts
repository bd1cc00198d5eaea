// The integration driver of integrator.ts for a pure mass-action system, entirely in WebAssembly:
// Dormand–Prince until its stiffness test fires, then the BDF (or one of them forced), the same
// step-size control, initial step, clipping of negatives and dense output. The JavaScript side
// (wasm-engine.ts) allocates and fills the tables, then calls `advanceTo` once per sample time.

import { bdfAccept, bdfInterpolate, bdfInvalidate, bdfNext, bdfStep, currentOrder, jacobians, startBdf, yNew as bdfYNew } from "./bdf";
import {
  explicitAccept,
  explicitInterpolate,
  explicitInvalidate,
  explicitNext,
  explicitOrder,
  explicitStep,
  explicitStiff,
  yNew as explicitYNew,
} from "./explicit";
import { factorizations } from "./lu";
import { errorNorm } from "./norm";
import { n, rhs } from "./system";

export { configureSystem } from "./system";
export { planSolver } from "./symbolic";
export { configureExplicit } from "./explicit";
export { configureBdf } from "./bdf";
export { setTolerances } from "./norm";

/** `advanceTo` results; the JavaScript side turns a failure into integrator.ts's message. */
const REACHED = 0;
const GAVE_UP = 1;
const UNDERFLOW = 2;

/** Methods as integrator.ts names them: auto starts explicit and may switch; bdf is stiff from the start. */
const AUTO = 0;
const EXPLICIT = 1;
const BDF = 2;

let method: i32 = AUTO;
let explicitActive = true;
let maxSteps: i32 = 0;
export let t: f64 = 0;
let h: f64 = 0;
export let steps: i32 = 0;
export let rejected: i32 = 0;
/** When the automatic choice switched to the BDF; NaN while it has not. */
export let switchedAt: f64 = NaN;
let nonNegative = false;
export let y: StaticArray<f64> = [];
export let sample: StaticArray<f64> = [];
/** The last accepted step: its start, its size and which method took it (for dense output). */
let lastStart: f64 = 0;
let lastH: f64 = 0;
let lastByExplicit = true;

// Memory for the JavaScript side: everything lives until the next `reset` (the stub runtime's
// bump allocator; one run at a time per instance).
export function reset(): void {
  __reset();
}

export function float64s(length: i32): usize {
  return changetype<usize>(new StaticArray<f64>(length));
}

export function int32s(length: i32): usize {
  return changetype<usize>(new StaticArray<i32>(length));
}

/** Starts a run from `initial` at t = 0 (after the configure calls). */
export function start(initial: StaticArray<f64>, methodCode: i32, clipsNegatives: bool, stepLimit: i32): void {
  method = methodCode;
  nonNegative = clipsNegatives;
  maxSteps = stepLimit;
  y = initial;
  sample = new StaticArray<f64>(n);
  t = 0;
  h = 0;
  steps = 0;
  rejected = 0;
  switchedAt = NaN;
  explicitActive = method != BDF;
  if (!explicitActive) startBdf();
}

export function jacobianCount(): i32 {
  return explicitActive ? 0 : jacobians;
}

export function factorizationCount(): i32 {
  return explicitActive ? 0 : factorizations;
}

/** 1 while the explicit pair steps, 0 once the BDF does. */
export function explicitMethod(): bool {
  return explicitActive;
}

/**
 * Steps towards `until` (landing on it exactly) until the last accepted step reaches `time`, then
 * writes the state at `time` into `sample`. Returns REACHED, GAVE_UP (maxSteps) or UNDERFLOW.
 */
export function advanceTo(time: f64, until: f64): i32 {
  if (h == 0) h = initialStep(until - t);
  while (t < time) {
    if (steps + rejected >= maxSteps) return GAVE_UP;
    const remaining = until - t;
    const landing = h >= remaining;
    const size = landing ? remaining : h;
    const error = explicitActive ? explicitStep(y, size) : bdfStep(y, size);
    const accepted = error <= 1;
    const proposal = explicitActive ? explicitNext(size, error, accepted) : bdfNext(size, error, accepted);
    if (!accepted) {
      rejected++;
      h = proposal;
      if (h <= 4 * f64.EPSILON * Math.max(Math.abs(t), 1)) return UNDERFLOW;
      continue;
    }
    if (explicitActive) explicitAccept();
    else bdfAccept();
    const end = landing ? until : t + size;
    const candidate = explicitActive ? explicitYNew : bdfYNew;
    for (let i = 0; i < n; i++) unchecked((y[i] = unchecked(candidate[i])));
    lastStart = t;
    lastH = size;
    lastByExplicit = explicitActive;
    t = end;
    steps++;
    h = landing ? Math.max(proposal, h) : proposal;
    if (nonNegative && clipNegatives()) {
      if (explicitActive) explicitInvalidate();
      else bdfInvalidate();
    }
    if (explicitActive && method == AUTO && explicitStiff()) switchToStiff();
  }
  if (time == t) {
    // The step's own result, before clipping (as integrator.ts samples it).
    const result = lastByExplicit ? explicitYNew : bdfYNew;
    for (let i = 0; i < n; i++) unchecked((sample[i] = unchecked(result[i])));
  } else if (lastByExplicit) explicitInterpolate((time - lastStart) / lastH, sample);
  else bdfInterpolate((time - lastStart) / lastH, sample);
  return REACHED;
}

function switchToStiff(): void {
  explicitActive = false;
  switchedAt = t;
  startBdf();
}

function clipNegatives(): bool {
  let changed = false;
  for (let i = 0; i < n; i++) {
    if (unchecked(y[i]) < 0) {
      unchecked((y[i] = 0));
      changed = true;
    }
  }
  return changed;
}

/** integrator.ts's initialStep (Hairer & Wanner's starting step). */
function initialStep(span: f64): f64 {
  const f0 = new StaticArray<f64>(n);
  rhs(y, f0);
  const zero = new StaticArray<f64>(n);
  const sizeY = errorNorm(y, y, zero);
  const sizeF = errorNorm(f0, y, zero);
  let first = sizeY <= 1e-10 || sizeF <= 1e-10 ? 1e-6 : 0.01 * (sizeY / sizeF);
  first = Math.min(first, span);
  const y1 = new StaticArray<f64>(n);
  for (let i = 0; i < n; i++) unchecked((y1[i] = unchecked(y[i]) + first * unchecked(f0[i])));
  const f1 = new StaticArray<f64>(n);
  rhs(y1, f1);
  for (let i = 0; i < n; i++) unchecked((f1[i] -= unchecked(f0[i])));
  const curvature = Math.max(errorNorm(f1, y, zero) / first, sizeF);
  const order = explicitActive ? explicitOrder() : currentOrder;
  const h1 = curvature <= 1e-15 ? Math.max(1e-6, first * 1e-3) : Math.pow(0.01 / curvature, 1 / <f64>order);
  const startStep = Math.min(Math.min(100 * first, h1), span);
  return isFinite(startStep) && startStep > 0 ? startStep : Math.min(1e-6, span);
}
