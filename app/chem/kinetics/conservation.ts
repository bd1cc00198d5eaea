// Linear algebra of the stoichiometric matrix S (variables × rates) for the integrator's
// analyses: the conservation laws (the left kernel of S) and an orthonormal basis of the
// stoichiometric subspace (the column space of S). Both are decided exactly (app/chem/linalg) and
// turned into doubles only at the end, so no tolerance decides how many laws there are.

import { independentRows, reducedNullSpace } from "~/chem/linalg/rational-matrix";
import * as Q from "~/chem/linalg/rational";
import type { Rational } from "~/chem/linalg/rational";
import { SimulationInputError } from "./errors";
import type { KineticSpec } from "./kinetic-system";

/** S as rows of variables, columns of rates. */
export function stoichiometricMatrix(spec: KineticSpec): number[][] {
  const rates = spec.monomials.length + spec.custom.length;
  const matrix = spec.names.map(() => new Array<number>(rates).fill(0));
  for (const { variable, rate, change } of spec.changes) matrix[variable][rate] += change;
  return matrix;
}

export interface ConservationBasis {
  /** One law per row, over the variables: w·y stays constant. */
  laws: number[][];
  /** For each law, a variable with coefficient 1 in it and 0 in every other law. */
  leading: number[];
}

/**
 * A basis of {w : wᵀS = 0} in reduced echelon form, each law leading with 1 on its highest
 * variable — so each law owns a variable no other law mentions.
 */
export function conservationBasis(stoichiometry: number[][]): ConservationBasis {
  const { basis, leading } = reducedNullSpace(exactReactionVectors(stoichiometry), stoichiometry.length);
  return { laws: basis.map((law) => law.map(Q.toNumber)), leading };
}

/** Orthonormal columns spanning the column space of S (modified Gram–Schmidt on independent columns). */
export function stoichiometricSubspace(stoichiometry: number[][]): number[][] {
  const n = stoichiometry.length;
  const basis: number[][] = [];
  for (const r of independentRows(exactReactionVectors(stoichiometry))) {
    const v = stoichiometry.map((row) => row[r]);
    for (const q of basis) {
      const dot = q.reduce((sum, qi, i) => sum + qi * v[i], 0);
      for (let i = 0; i < n; i++) v[i] -= dot * q[i];
    }
    const remaining = Math.hypot(...v);
    basis.push(v.map((x) => x / remaining));
  }
  return basis;
}

/**
 * The columns of S as exact rows. A network's changes are integers; a polynomial ODE's are the
 * doubles of its coefficients, read back as the simplest fractions they round from (8/3, 1/10).
 */
function exactReactionVectors(stoichiometry: number[][]): Rational[][] {
  const rates = stoichiometry[0]?.length ?? 0;
  return Array.from({ length: rates }, (_, r) => stoichiometry.map((row) => exactChange(row[r])));
}

function exactChange(change: number): Rational {
  if (change === 0) return Q.ZERO;
  // An ODE coefficient such as 10^400 parses, but no law or direction can be read from infinity.
  if (!Number.isFinite(change)) throw new SimulationInputError(`a coefficient of the system is ${change}, beyond the range of double-precision numbers`);
  return Q.simplestRational(change);
}
