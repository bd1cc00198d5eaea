// Transformations that map a polynomial ODE to one whose trajectories can live in the positive
// orthant, so that it may become kinetic.
import { negativeCrossEffects } from "./cross-effects";
import type { ExactOde } from "./exact";
import * as P from "./polynomial";
import type { Polynomial } from "./polynomial";
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";

/**
 * Translation u = x + s: u' = P(u − s), u(0) = x(0) + s. Trajectories are the old ones moved by s,
 * so a trajectory that stays above −s stays in the positive orthant of u.
 */
export function translate(ode: ExactOde, shift: readonly Rational[]): ExactOde {
  const n = ode.variables.length;
  const shifted = ode.variables.map((_, j) => P.sub(P.variable(n, j), P.constant(n, shift[j])));
  const substitute = (p: Polynomial) =>
    [...p.values()].reduce(
      (sum, term) =>
        P.add(
          sum,
          term.exponents.reduce((product, e, j) => P.mul(product, P.power(shifted[j], e, n)), P.constant(n, term.coefficient)),
        ),
      P.zero(),
    );
  return { variables: [...ode.variables], rhs: ode.rhs.map(substitute), initial: ode.initial.map((v, j) => Q.add(v, shift[j])) };
}

/**
 * Multiplies every right-hand side by the monomial x^exponents. In the positive orthant this is a
 * change of time scale (dt = x^a ds, s the new time; see time-scale.ts): the orbits are the same,
 * traversed at another speed. Once x^a contains every variable, every term contains x_i, so there
 * is no negative cross effect left.
 */
export function multiplyByMonomial(ode: ExactOde, exponents: readonly number[]): ExactOde {
  const factor = P.fromTerms([{ exponents: [...exponents], coefficient: Q.ONE }]);
  return { ...ode, variables: [...ode.variables], rhs: ode.rhs.map((p) => P.mul(p, factor)) };
}

/** The default multiplier: the product of all variables. */
export const productOfAllVariables = (ode: ExactOde) => ode.variables.map(() => 1);

/**
 * The lowest-degree monomial that removes every negative cross effect: x_i to the first power for
 * each equation i that has one (then every term of x_i' contains x_i), nothing for the others.
 * Fewer factors mean reactions of lower order.
 */
export function smallestMultiplier(ode: ExactOde): number[] {
  const offending = new Set(negativeCrossEffects(ode).map((e) => e.equation));
  return ode.variables.map((v) => (offending.has(v) ? 1 : 0));
}
