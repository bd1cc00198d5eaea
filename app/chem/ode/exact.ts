// The exact form of a polynomial ODE that the realization algebra works on; `PolynomialOde` (model.ts)
// is its floating-point image for the integrator.
import type { PolynomialOde } from "../model";
import type { Polynomial } from "./polynomial";
import { toMonomials } from "./polynomial";
import type { Rational } from "../linalg/rational";
import { toNumber } from "../linalg/rational";

export interface ExactOde {
  variables: string[];
  /** rhs[i] is the right-hand side of variables[i]. */
  rhs: Polynomial[];
  /** Initial values, 0 where none was given. */
  initial: Rational[];
}

export function toPolynomialOde(ode: ExactOde): PolynomialOde {
  return {
    variables: [...ode.variables],
    rhs: ode.rhs.map(toMonomials),
    initial: ode.initial.map(toNumber),
  };
}
