import { describe, expect, it } from "vitest";
import { dormandPrince54 } from "./dormand-prince";
import { ExplicitRungeKutta } from "./explicit-runge-kutta";
import type { OdeSystem } from "./ode-system";
import { rodas4 } from "./rodas4";
import { Rosenbrock } from "./rosenbrock";
import type { Stepper } from "./stepper";

// The observed order of convergence with fixed steps: the error at T against the exact solution
// for step sizes T/N, and the least-squares slope of log(error) over log(h). The problem is
// logistic growth driving a decay, x' = x(1 − x), y' = −x·y: smooth, nonlinear and coupled, with
// the closed form x = x_0·e^t / d, y = y_0 / d, d = 1 − x_0 + x_0·e^t (common practice, no source).
// The step counts keep the error well above round-off and past the coarse steps where the next
// error term still shows (Dormand–Prince's leading error constant is deliberately small).

const x0 = 0.1;
const until = 3;

const logisticDecay: OdeSystem = {
  names: ["x", "y"],
  initial: Float64Array.of(x0, 1),
  nonNegative: false,
  rhs(state, dy) {
    const [x, y] = state;
    dy[0] = x * (1 - x);
    dy[1] = -x * y;
  },
  jacobian(state, jacobian) {
    const [x, y] = state;
    jacobian[0] = 1 - 2 * x;
    jacobian[1] = 0;
    jacobian[2] = -y;
    jacobian[3] = -x;
  },
};

function exact(t: number): [number, number] {
  const d = 1 - x0 + x0 * Math.exp(t);
  return [(x0 * Math.exp(t)) / d, 1 / d];
}

/** Max-norm error at `until` after `steps` equal steps; the error estimate is not consulted. */
function fixedStepError(method: Stepper, steps: number): number {
  const y = Float64Array.from(logisticDecay.initial);
  const h = until / steps;
  for (let i = 0; i < steps; i++) {
    method.step(y, h);
    method.accept();
    y.set(method.yNew);
  }
  const [x, yExact] = exact(until);
  return Math.max(Math.abs(y[0] - x), Math.abs(y[1] - yExact));
}

function observedOrder(makeMethod: () => Stepper): number {
  const points = stepCounts.map((steps) => ({ x: Math.log(until / steps), y: Math.log(fixedStepError(makeMethod(), steps)) }));
  const meanX = points.reduce((sum, p) => sum + p.x, 0) / points.length;
  const meanY = points.reduce((sum, p) => sum + p.y, 0) / points.length;
  const covariance = points.reduce((sum, p) => sum + (p.x - meanX) * (p.y - meanY), 0);
  const variance = points.reduce((sum, p) => sum + (p.x - meanX) ** 2, 0);
  return covariance / variance;
}

/** Only the error estimate reads these, and fixed steps ignore it. */
const tolerances = { rtol: 1e-6, atol: 1e-6 };
const stepCounts = [32, 48, 64, 96, 128];

describe("observed order of convergence with fixed steps", () => {
  it("is 4 for RODAS4", () => {
    const order = observedOrder(() => new Rosenbrock(rodas4, logisticDecay, tolerances));
    expect(Math.abs(order - 4)).toBeLessThan(0.2);
  });

  it("is 5 for Dormand–Prince 5(4)", () => {
    const order = observedOrder(() => new ExplicitRungeKutta(dormandPrince54, logisticDecay, tolerances));
    expect(Math.abs(order - 5)).toBeLessThan(0.2);
  });
});
