import { describe, expect, it } from "vitest";
import { Bdf } from "./bdf";
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

function exact(t: number): Float64Array {
  const d = 1 - x0 + x0 * Math.exp(t);
  return Float64Array.of((x0 * Math.exp(t)) / d, 1 / d);
}

/**
 * Max-norm error at `until` after `steps` equal steps; the error estimate is not consulted. A
 * multistep method is seeded with the exact solution at the first `given` + 1 times and takes the
 * remaining steps itself.
 */
function fixedStepError(method: Stepper, steps: number, given = 0): number {
  const h = until / steps;
  const y = Float64Array.from(exact(given * h));
  for (let i = given; i < steps; i++) {
    method.step(y, h);
    method.accept();
    y.set(method.yNew);
  }
  const [x, yExact] = exact(until);
  return Math.max(Math.abs(y[0] - x), Math.abs(y[1] - yExact));
}

function observedOrder(makeMethod: () => Stepper): number {
  return slope(stepCounts.map((steps) => ({ x: Math.log(until / steps), y: Math.log(fixedStepError(makeMethod(), steps)) })));
}

/** The least-squares slope of y over x. */
function slope(points: { x: number; y: number }[]): number {
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

  // The numerical differentiation formulas have order k (Shampine & Reichelt 1997, §2.1). The Newton
  // iteration must converge far below the truncation error, hence the tight tolerances. The higher
  // orders need smaller steps to reach their asymptotic slope (order 5 still shows 5.3 here, and
  // round-off takes over below 1e-13), hence the longer step counts and the wider margin.
  const bdfStepCounts = [128, 192, 256, 384, 512];
  for (const order of [1, 2, 3, 4, 5]) {
    it(`is ${order} for the BDF/NDF of order ${order}`, () => {
      const points = bdfStepCounts.map((steps) => {
        const h = until / steps;
        const bdf = new Bdf(logisticDecay, { rtol: 1e-13, atol: 1e-13, maxOrder: order });
        bdf.seed(Array.from({ length: order + 1 }, (_, j) => exact((order - j) * h)), h);
        return { x: Math.log(h), y: Math.log(fixedStepError(bdf, steps, order)) };
      });
      expect(Math.abs(slope(points) - order)).toBeLessThan(0.35);
    });
  }
});
