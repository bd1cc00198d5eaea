// A translation vector read off a simulated trajectory: move each variable so that its observed
// minimum sits a margin above zero. This is evidence from one finite run, not a proof that the
// trajectory stays in the shifted orthant.
import type { PolynomialOde } from "../model";
import * as Q from "./rational";
import type { Rational } from "./rational";

export interface ShiftSuggestion {
  shift: Record<string, number>;
  exact: Rational[];
  /** The observed bounding box, per variable. */
  box: Record<string, { min: number; max: number }>;
  until: number;
}

export interface TrajectorySampler {
  (ode: PolynomialOde, options: { until: number; samples: number }): Promise<{ series: Record<string, number[]> }>;
}

/** The margin is a tenth of the observed range (1 when the variable did not move). */
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

export async function suggestShift(
  ode: PolynomialOde,
  sample: TrajectorySampler,
  { until = 50, samples = 2000 }: { until?: number; samples?: number } = {},
): Promise<ShiftSuggestion> {
  const { series } = await sample(ode, { until, samples });
  const box = Object.fromEntries(
    ode.variables.map((v) => {
      const values = series[v].filter(Number.isFinite);
      if (values.length < series[v].length) throw new Error(`the simulation of ${v} did not stay finite up to t = ${until}`);
      return [v, { min: Math.min(...values), max: Math.max(...values) }];
    }),
  );
  const exact = shiftFromBox(box, ode.variables);
  return { shift: Object.fromEntries(ode.variables.map((v, i) => [v, Q.toNumber(exact[i])])), exact, box, until };
}
