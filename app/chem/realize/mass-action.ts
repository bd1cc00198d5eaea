// A mass-action mechanism with exact rate coefficients, the common currency of the realization
// algorithms: complexes as exponent vectors over `species`.
import * as P from "../ode/polynomial";
import type { Polynomial } from "../ode/polynomial";
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";

export interface MassActionReaction {
  reactant: number[];
  product: number[];
  rate: Rational;
}

export interface MassActionMechanism {
  species: string[];
  reactions: MassActionReaction[];
}

/** The induced kinetic ODE: x_i' = Σ rate · x^reactant · (product_i − reactant_i). */
export function inducedRhs(mechanism: MassActionMechanism): Polynomial[] {
  return mechanism.species.map((_, i) =>
    P.fromTerms(
      mechanism.reactions.map((r) => ({
        exponents: r.reactant,
        coefficient: Q.mul(r.rate, Q.rational(r.product[i] - r.reactant[i])),
      })),
    ),
  );
}

/** The order of the mechanism: the largest total degree of a reactant complex (0 if none). */
export function maxOrder(mechanism: MassActionMechanism): number {
  return Math.max(0, ...mechanism.reactions.map((r) => P.totalDegree(r.reactant)));
}
