// The JavaScript side of the WebAssembly engine (assembly/engine.ts): loads the module once per
// process or worker thread, hands it a pure mass-action system as tables (rates, changes, the
// Jacobian's sparsity pattern, the Dormand–Prince tableau, the NDF coefficients; the engine plans
// the sparse LU itself), and steps it from sample time to sample time. It
// ports integrator.ts's automatic choice with Dormand–Prince and the BDF: V8 compiles WebAssembly
// to machine code at once, so a fresh process does not run the stepping loop in its interpreter.
// Node only (simulations run on the server); the generated engine.wasm sits beside this module,
// or beside the bundle (scripts/bundle.mjs copies it there).

import { readFileSync } from "node:fs";
import { ALPHA, ERROR_CONSTANT, GAMMA } from "../bdf";
import { dormandPrince54 } from "../dormand-prince";
import { IntegrationFailure } from "../errors";
import { TIGHT_RTOL, type Method, type StepStatistics } from "../integrator";
import type { KineticSystem } from "../kinetic-system";
import type { OdeSystem } from "../ode-system";
import { SPARSE_MAX_FILL, SPARSE_MIN_SIZE } from "../shifted-lu";

interface EngineExports {
  memory: WebAssembly.Memory;
  t: WebAssembly.Global;
  steps: WebAssembly.Global;
  rejected: WebAssembly.Global;
  switchedAt: WebAssembly.Global;
  sample: WebAssembly.Global;
  reset(): void;
  float64s(length: number): number;
  int32s(length: number): number;
  setTolerances(rtol: number, atol: number): void;
  configureSystem(n: number, ...tables: number[]): void;
  planSolver(minSize: number, maxFill: number): void;
  configureExplicit(stages: number, order: number, stabilityBoundary: number, ...tables: number[]): void;
  configureBdf(gamma: number, alpha: number, errorConstant: number, nonNegative: boolean): void;
  start(initial: number, method: number, nonNegative: boolean, maxSteps: number): void;
  advanceTo(time: number, until: number): number;
  jacobianCount(): number;
  factorizationCount(): number;
  explicitMethod(): number;
}

/** `advanceTo` results and method codes, as assembly/engine.ts numbers them. */
const REACHED = 0;
const GAVE_UP = 1;
const METHOD_CODES: Partial<Record<Method, number>> = { auto: 0, explicit: 1, bdf: 2 };

export interface EngineSettings {
  rtol: number;
  atol: number;
  method: Method;
  maxSteps: number;
}

let engine: EngineExports | null = null;
/** The run the engine's memory belongs to: one at a time per thread, each reset on creation. */
let activeRun: WasmRun | null = null;
let compiling: Promise<void> | null = null;
let compiled: WebAssembly.Module | null = null;

const engineBytes = () => readFileSync(new URL("./engine.wasm", import.meta.url));

/**
 * Starts compiling the engine on V8's background threads, as a program loads its code: a caller
 * with other work first (reading and parsing a text, a worker thread waiting for its first job)
 * then finds it ready instead of compiling it in the run (about 3 ms).
 */
export function compileEngineAhead(): Promise<void> {
  compiling ??= Promise.resolve()
    .then(() => WebAssembly.compile(engineBytes()))
    .then(
      (module) => void (compiled = module),
      () => undefined, // `loaded` compiles at once and reports the failure in the run
    );
  return compiling;
}

/** Instantiated on first use, synchronously (compiled then too unless compiled ahead), once per process or thread. */
function loaded(): EngineExports {
  engine ??= new WebAssembly.Instance(compiled ?? new WebAssembly.Module(engineBytes()), {
    env: {
      abort() {
        throw new Error("the WebAssembly engine aborted");
      },
    },
  }).exports as unknown as EngineExports;
  return engine;
}

/**
 * Whether the engine runs this system with these settings: pure mass action, and a run the JS
 * Integrator would do with Dormand–Prince and the BDF only (RODAS4 stays in JavaScript).
 */
export function engineRuns(system: OdeSystem, { method, rtol }: EngineSettings): system is KineticSystem {
  if (!("massAction" in system) || !system.massAction) return false;
  if (method === "bdf" || method === "explicit") return true;
  return (method === "auto" || method === "stiff") && rtol > TIGHT_RTOL;
}

/** A run of the engine from the system's initial state at t = 0 towards `until`. */
export class WasmRun {
  private readonly engine = loaded();
  private readonly n: number;
  private readonly maxSteps: number;

  constructor(
    system: KineticSystem,
    settings: EngineSettings,
    private readonly until: number,
  ) {
    const tables = system.massAction;
    if (!tables) throw new Error("WasmRun needs a pure mass-action system");
    const { engine } = this;
    this.n = system.names.length;
    this.maxSteps = settings.maxSteps;
    activeRun = this;
    engine.reset();
    engine.setTolerances(settings.rtol, settings.atol);
    const pattern = compressedPattern(system);
    engine.configureSystem(
      this.n,
      this.float64s(system.coefficients),
      this.int32s(tables.factorStart),
      this.int32s(tables.factorVariable),
      this.float64s(tables.factorPower),
      this.int32s(tables.variableStart),
      this.int32s(tables.variableRate),
      this.float64s(tables.variableChange),
      this.int32s(tables.rateStart),
      this.int32s(tables.rateVariable),
      this.float64s(tables.rateChange),
      this.int32s(pattern.start),
      this.int32s(pattern.column),
    );
    engine.planSolver(SPARSE_MIN_SIZE, SPARSE_MAX_FILL);
    this.configureExplicit();
    engine.configureBdf(this.float64s(GAMMA), this.float64s(ALPHA), this.float64s(ERROR_CONSTANT), system.nonNegative);
    const method = settings.method === "stiff" ? "bdf" : settings.method;
    engine.start(this.float64s(system.initial), METHOD_CODES[method] as number, system.nonNegative, settings.maxSteps);
  }

  /** The state at `time` (ascending from call to call); a view into the engine's memory, valid until the next call. */
  advanceTo(time: number): Float64Array {
    const { engine } = this;
    if (activeRun !== this) throw new Error("another WasmRun has started since this one: the engine runs one at a time per thread");
    const status = engine.advanceTo(time, this.until);
    const at = (engine.t.value as number).toPrecision(6);
    if (status === GAVE_UP) {
      throw new IntegrationFailure(`gave up after ${this.maxSteps} steps at t = ${at}`);
    }
    if (status !== REACHED) throw new IntegrationFailure(`step size underflow at t = ${at}`);
    return new Float64Array(engine.memory.buffer, engine.sample.value as number, this.n);
  }

  get statistics(): StepStatistics {
    const { engine } = this;
    return {
      steps: engine.steps.value,
      rejected: engine.rejected.value,
      jacobians: engine.jacobianCount(),
      factorizations: engine.factorizationCount(),
      method: this.method === "explicit" ? "dormand-prince" : "bdf",
    };
  }

  get method(): "stiff" | "explicit" {
    return this.engine.explicitMethod() ? "explicit" : "stiff";
  }

  get switchedAt(): number | null {
    const at = this.engine.switchedAt.value as number;
    return Number.isNaN(at) ? null : at;
  }

  /** Dormand–Prince's tableau rows as non-zero terms: stage rows, then b, e and the dense row. */
  private configureExplicit(): void {
    const pair = dormandPrince54;
    const rows = [...pair.a, pair.b, pair.e, pair.dense];
    const start = [0];
    const index: number[] = [];
    const weight: number[] = [];
    for (const row of rows) {
      row.forEach((w, j) => {
        if (w === 0) return;
        index.push(j);
        weight.push(w);
      });
      start.push(index.length);
    }
    const { exponent, beta, predictive, safety, maxGrowth, maxShrink, errorFloor } = pair.controller;
    this.engine.configureExplicit(
      pair.e.length,
      pair.order,
      pair.stabilityBoundary,
      this.int32s(start),
      this.int32s(index),
      this.float64s(weight),
      this.float64s([exponent, beta, predictive ? 1 : 0, safety, maxGrowth, maxShrink, errorFloor]),
    );
  }

  /** Copies values into a new array of doubles in the engine's memory; returns its address. */
  private float64s(values: ArrayLike<number>): number {
    return this.copied(values, this.engine.float64s(values.length), Float64Array);
  }

  private int32s(values: ArrayLike<number>): number {
    return this.copied(values, this.engine.int32s(values.length), Int32Array);
  }

  private copied(values: ArrayLike<number>, address: number, View: Float64ArrayConstructor | Int32ArrayConstructor): number {
    new View(this.engine.memory.buffer, address, values.length).set(values);
    return address;
  }
}

interface CompressedPattern {
  start: Int32Array;
  column: Int32Array;
}

/** The system's sparsity pattern in compressed rows (sorted columns). */
function compressedPattern(system: KineticSystem): CompressedPattern {
  const n = system.names.length;
  const rows = system.sparsity;
  const start = new Int32Array(n + 1);
  rows.forEach((row, i) => (start[i + 1] = start[i] + row.length));
  return { start, column: Int32Array.from(rows.flat()) };
}
