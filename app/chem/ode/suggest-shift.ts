// A translation vector read off a simulated trajectory: move each variable so that its observed
// minimum sits a margin above zero. This is evidence from one finite run, not a proof that the
// trajectory stays in the shifted orthant.
import { simulatePolynomialOde } from "../kinetics/simulate";
import type { PolynomialOde } from "../model";
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";

export interface ShiftSuggestion {
  shift: Record<string, number>;
  exact: Rational[];
  /** The observed bounding box, per variable. */
  box: Record<string, { min: number; max: number }>;
  until: number;
}

/** The margin is a tenth of the observed range (when the variable did not move: 1, or a tenth of its value if larger). */
const MARGIN_FRACTION = 0.1;

export function shiftFromBox(box: Record<string, { min: number; max: number }>, variables: readonly string[]): Rational[] {
  return variables.map((v) => {
    const { min, max } = box[v];
    const margin = max > min ? MARGIN_FRACTION * (max - min) : Math.max(1, MARGIN_FRACTION * Math.abs(min));
    return min >= margin ? Q.ZERO : roundUpNicely(margin - min);
  });
}

/** Rounds up to two significant digits so the shifted ODE keeps readable coefficients (21.37 → 22). */
export function roundUpNicely(value: number): Rational {
  const step = Math.floor(Math.log10(value)) - 1;
  const units = BigInt(Math.ceil(value / 10 ** step - 1e-9));
  return step >= 0 ? Q.rational(units * 10n ** BigInt(step)) : Q.rational(units, 10n ** BigInt(-step));
}

export interface Horizon {
  until: number;
  samples: number;
}

export const DEFAULT_HORIZON: Horizon = { until: 50, samples: 2000 };

/** The observed bounding box of the trajectory from the ODE's initial values. */
export function boundingBox(ode: PolynomialOde, { until, samples }: Horizon): Record<string, { min: number; max: number }> {
  const { series } = simulatePolynomialOde(ode, { until, samples });
  return Object.fromEntries(
    ode.variables.map((v) => {
      const values = series[v];
      if (!values.every(Number.isFinite)) throw new Error(`the simulation of ${v} did not stay finite up to t = ${until}`);
      return [v, { min: Math.min(...values), max: Math.max(...values) }];
    }),
  );
}

export function suggestShift(ode: PolynomialOde, horizon: Horizon = DEFAULT_HORIZON): ShiftSuggestion {
  const box = boundingBox(ode, horizon);
  const exact = shiftFromBox(box, ode.variables);
  return { shift: Object.fromEntries(ode.variables.map((v, i) => [v, Q.toNumber(exact[i])])), exact, box, until: horizon.until };
}
