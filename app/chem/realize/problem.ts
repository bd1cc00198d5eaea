// The data of a dynamic-equivalence search (Szederkényi 2009/2010): candidate complexes y_1..y_m and,
// for each, the column M_j of the ODE's coefficients of the monomial x^{y_j}. A mechanism on these
// complexes with Kirchhoff matrix A_k realizes the ODE iff Y·A_k = M.
import type { ExactOde } from "../ode/exact";
import { exponentKey } from "../ode/polynomial";
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";
import { canonicalRealization } from "./canonical";

export interface RealizationProblem {
  species: string[];
  complexes: number[][];
  /** targets[j][s]: the coefficient of x^{complexes[j]} in species s' equation. */
  targets: Rational[][];
}

/**
 * Candidate complexes: those of the canonical realization (so a solution always exists) followed by
 * any extra ones, duplicates dropped. Throws for a non-kinetic ODE, which has no realization at all.
 */
export function realizationProblem(ode: Pick<ExactOde, "variables" | "rhs">, extraComplexes: readonly number[][] = []): RealizationProblem {
  const canonical = canonicalRealization({ ...ode, initial: [] });
  return problemOnComplexes(ode, [...canonical.reactions.flatMap((r) => [r.reactant, r.product]), ...extraComplexes]);
}

/** The search restricted to the given complexes; each monomial of the ODE must be one of them. */
export function problemOnComplexes(ode: Pick<ExactOde, "variables" | "rhs">, candidates: readonly number[][]): RealizationProblem {
  const unique = new Map(candidates.map((c) => [exponentKey(c), [...c]]));
  const missing = ode.rhs.flatMap((p) => [...p.keys()]).find((key) => !unique.has(key));
  if (missing !== undefined) throw new RangeError(`the monomial with exponents (${missing}) is not among the candidate complexes`);
  const complexes = [...unique.values()];
  const targets = complexes.map((complex) => ode.rhs.map((p) => p.get(exponentKey(complex))?.coefficient ?? Q.ZERO));
  return { species: [...ode.variables], complexes, targets };
}
