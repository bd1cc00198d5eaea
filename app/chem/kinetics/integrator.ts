// The adaptive driver around a method: step-size control, landing exactly on requested times,
// sampling through dense output, statistics, cancellation, and the automatic choice of method —
// the explicit pair until its stiffness test fires, then a stiff method picked by the tolerance:
// RODAS4 (one step, order 4 at once) for tight tolerances, the variable-order BDF (Jacobian and
// LU reused over many steps) otherwise.

import { Bdf } from "./bdf";
import { dormandPrince54 } from "./dormand-prince";
import { IntegrationFailure, SimulationCancelled } from "./errors";
import { ExplicitRungeKutta } from "./explicit-runge-kutta";
import type { OdeSystem } from "./ode-system";
import { rodas4 } from "./rodas4";
import { Rosenbrock } from "./rosenbrock";
import { StepSizeController } from "./step-size-controller";
import { errorNorm, type StepSizeChooser, type Stepper, type Tolerances } from "./stepper";

/** What a run asks for: a family chosen automatically ("auto", "stiff") or one method by name. */
export type Method = "auto" | "stiff" | "explicit" | "bdf" | "rodas4";
/** The methods that actually step. */
export type MethodName = "dormand-prince" | "rodas4" | "bdf";

/**
 * At or below this rtol the stiff choice is RODAS4: the BDF's error constants grow with its order
 * and its order is capped at 5, so at tight tolerances it takes many short steps, while RODAS4's
 * single-step order 4 with a fresh Jacobian each step stays efficient.
 */
export const TIGHT_RTOL = 1e-8;

export interface IntegratorOptions extends Tolerances {
  method: Method;
  /** Accepted plus rejected steps before giving up. */
  maxSteps?: number;
  signal?: AbortSignal;
}

export interface StepStatistics {
  steps: number;
  rejected: number;
  jacobians: number;
  /** Numeric LU factorisations of the iteration matrix. */
  factorizations: number;
  /** The method that took the last step. */
  method: MethodName;
}

export const DEFAULT_MAX_STEPS = 2_000_000;

export class Integrator {
  t: number;
  readonly y: Float64Array;
  steps = 0;
  rejected = 0;
  /** When the automatic choice switched to the stiff method, the time it did; null otherwise. */
  switchedAt: number | null = null;
  private stepper: Stepper;
  private controller: StepSizeChooser;
  private explicit: ExplicitRungeKutta | null;
  private jacobiansBeforeSwitch = 0;
  private h = 0;
  private readonly maxSteps: number;
  /**
   * rtol and atol alone: every call of the hot `errorNorm` then sees objects of one shape, which
   * keeps its optimised code monomorphic (the whole options object made it deoptimise).
   */
  private readonly tolerances: Tolerances;

  constructor(
    private readonly system: OdeSystem,
    private readonly options: IntegratorOptions,
    initial: Float64Array = system.initial,
    start = 0,
  ) {
    this.y = Float64Array.from(initial);
    this.t = start;
    this.maxSteps = options.maxSteps ?? DEFAULT_MAX_STEPS;
    this.tolerances = { rtol: options.rtol, atol: options.atol };
    const explicitFirst = options.method === "auto" || options.method === "explicit";
    this.explicit = explicitFirst ? new ExplicitRungeKutta(dormandPrince54, system, this.tolerances) : null;
    this.stepper = this.explicit ?? this.stiffStepper();
    this.controller = chooserFor(this.stepper);
  }

  get method(): "stiff" | "explicit" {
    return this.explicit ? "explicit" : "stiff";
  }

  get statistics(): StepStatistics {
    const { stepper } = this;
    const method = stepper instanceof Bdf ? "bdf" : stepper instanceof Rosenbrock ? "rodas4" : "dormand-prince";
    const jacobians = this.jacobiansBeforeSwitch + stepper.jacobians;
    return { steps: this.steps, rejected: this.rejected, jacobians, factorizations: stepper.factorizations, method };
  }

  /** Replaces the state (renormalisation, a new start); the step size is kept. */
  setState(y: ArrayLike<number>): void {
    this.y.set(y);
    this.stepper.invalidate();
  }

  /**
   * Integrates to exactly `until`. `sample(time, state)` is called for each of `times` (ascending,
   * in (t, until]) with the dense-output state; the buffer is reused between calls. `afterStep(y)`
   * sees the state after each accepted step and may change it in place (returning true when it did).
   */
  advance(
    until: number,
    times: readonly number[] = [],
    sample?: (time: number, state: Float64Array) => void,
    afterStep?: (y: Float64Array) => boolean,
  ): void {
    const { system, options } = this;
    const state = new Float64Array(this.y.length);
    let next = 0;
    if (this.h === 0) this.h = this.initialStep(until - this.t);
    while (this.t < until) {
      if (options.signal?.aborted) throw new SimulationCancelled();
      if (this.steps + this.rejected >= this.maxSteps) {
        throw new IntegrationFailure(`gave up after ${this.maxSteps} steps at t = ${this.t.toPrecision(6)}`);
      }
      const remaining = until - this.t;
      const landing = this.h >= remaining;
      const h = landing ? remaining : this.h;
      const error = this.stepper.step(this.y, h);
      const accepted = error <= 1;
      const proposal = this.controller.next(h, error, accepted);
      if (!accepted) {
        this.rejected++;
        this.h = proposal;
        if (this.h <= 4 * Number.EPSILON * Math.max(Math.abs(this.t), 1)) {
          throw new IntegrationFailure(`step size underflow at t = ${this.t.toPrecision(6)}`);
        }
        continue;
      }
      this.stepper.accept();
      const end = landing ? until : this.t + h;
      while (next < times.length && times[next] <= end) {
        const time = times[next++];
        if (time === end) state.set(this.stepper.yNew);
        else this.stepper.interpolate((time - this.t) / h, state);
        sample?.(time, state);
      }
      this.y.set(this.stepper.yNew);
      this.t = end;
      this.steps++;
      // A step shortened to land on `until` says little about the step the problem allows.
      this.h = landing ? Math.max(proposal, this.h) : proposal;
      const clipped = system.nonNegative && clipNegatives(this.y);
      if (afterStep?.(this.y) || clipped) this.stepper.invalidate();
      if (this.explicit?.stiff && options.method === "auto") this.switchToStiff();
    }
  }

  private switchToStiff(): void {
    this.jacobiansBeforeSwitch += this.stepper.jacobians;
    this.stepper = this.stiffStepper();
    this.controller = chooserFor(this.stepper);
    this.explicit = null;
    this.switchedAt = this.t;
  }

  private stiffStepper(): Stepper {
    const { method, rtol } = this.options;
    const rosenbrock = method === "rodas4" || (method !== "bdf" && rtol <= TIGHT_RTOL);
    return rosenbrock ? new Rosenbrock(rodas4, this.system, this.tolerances) : new Bdf(this.system, this.tolerances);
  }

  /** Hairer & Wanner's starting step (Solving ODEs I, §II.4): from |y|, |f| and a trial Euler step. */
  private initialStep(span: number): number {
    const { system, y } = this;
    const n = y.length;
    const f0 = new Float64Array(n);
    system.rhs(y, f0);
    const zero = new Float64Array(n);
    const sizeY = errorNorm(y, y, zero, this.tolerances);
    const sizeF = errorNorm(f0, y, zero, this.tolerances);
    let h = sizeY <= 1e-10 || sizeF <= 1e-10 ? 1e-6 : 0.01 * (sizeY / sizeF);
    h = Math.min(h, span);
    const y1 = new Float64Array(n);
    for (let i = 0; i < n; i++) y1[i] = y[i] + h * f0[i];
    const f1 = new Float64Array(n);
    system.rhs(y1, f1);
    for (let i = 0; i < n; i++) f1[i] -= f0[i];
    const curvature = Math.max(errorNorm(f1, y, zero, this.tolerances) / h, sizeF);
    const h1 = curvature <= 1e-15 ? Math.max(1e-6, h * 1e-3) : Math.pow(0.01 / curvature, 1 / this.stepper.order);
    const start = Math.min(100 * h, h1, span);
    return Number.isFinite(start) && start > 0 ? start : Math.min(1e-6, span);
  }
}

/** A one-step method gets the shared controller with its settings; a multistep method chooses itself. */
function chooserFor(stepper: Stepper): StepSizeChooser {
  const { controller } = stepper;
  return "next" in controller ? controller : new StepSizeController(controller);
}

/** Sets negative entries to 0; true when any changed. */
function clipNegatives(y: Float64Array): boolean {
  let changed = false;
  for (let i = 0; i < y.length; i++) {
    if (y[i] < 0) {
      y[i] = 0;
      changed = true;
    }
  }
  return changed;
}
