// The clock of an ODE multiplied by a monomial m(x). Where m > 0, the system x' = m(x)·f(x) in its
// own time s has the orbits of x' = f(x) in time t, with dt = m(x) ds: one unit of s covers m(x)
// units of t. So reaching the original time T takes s(T) = ∫₀ᵀ dt / m(x(t)) along the original
// trajectory (a change of time variable; e.g. Hirsch, Smale and Devaney, ch. 8–9).
import { simulatePolynomialOde } from "../kinetics/simulate";
import type { PolynomialOde } from "../model";
import type { ExactOde } from "./exact";
import { toPolynomialOde } from "./exact";

export interface RescaledHorizon {
  /** The end time of the multiplied system that matches the original horizon. */
  until: number;
  /**
   * "trajectory": s(T) integrated along the simulated original trajectory (which stayed where m > 0);
   * "initial state": T / m(x(0)), when the trajectory could not be simulated or left the orthant,
   * which is only right while m stays near its initial value.
   */
  basis: "trajectory" | "initial state";
}

/** Enough samples that the trapezoidal rule on 1/m is far more accurate than the estimate needs. */
const SAMPLES = 4000;

const monomialValue = (exponents: readonly number[], state: readonly number[]) =>
  exponents.reduce((product, e, i) => product * state[i] ** e, 1);

/**
 * The end time for `ode` multiplied by x^exponents that covers `ode`'s times 0..until, or null
 * when not even the initial state gives a positive multiplier.
 */
export function rescaledHorizon(ode: ExactOde, exponents: readonly number[], until: number): RescaledHorizon | null {
  const polynomial = toPolynomialOde(ode);
  const fromTrajectory = integrateInverse(polynomial, exponents, until);
  if (fromTrajectory !== null) return { until: fromTrajectory, basis: "trajectory" };
  const atStart = monomialValue(exponents, polynomial.initial);
  return atStart > 0 && Number.isFinite(atStart) ? { until: until / atStart, basis: "initial state" } : null;
}

/** ∫₀ᵀ dt / m(x(t)) by the trapezoidal rule, or null when m ≤ 0 somewhere on the simulated trajectory. */
function integrateInverse(ode: PolynomialOde, exponents: readonly number[], until: number): number | null {
  let simulated;
  try {
    simulated = simulatePolynomialOde(ode, { until, samples: SAMPLES });
  } catch {
    return null;
  }
  const columns = ode.variables.map((v) => simulated.series[v]);
  const inverse = simulated.t.map((_, k) => 1 / monomialValue(exponents, columns.map((c) => c[k])));
  if (!inverse.every((value) => value > 0 && Number.isFinite(value))) return null;
  let integral = 0;
  for (let k = 1; k < inverse.length; k++) integral += ((simulated.t[k] - simulated.t[k - 1]) * (inverse[k] + inverse[k - 1])) / 2;
  return integral;
}
