// Hárs and Tóth (1979): a polynomial ODE is kinetic — the induced ODE of some mass-action
// mechanism — iff it has no negative cross effect, i.e. no term with a negative coefficient in
// x_i' whose monomial does not contain x_i (such a term could drive x_i below zero at x_i = 0).
import type { ExactOde } from "./exact";
import { formatTerm } from "./format";
import type { EquationSource, SourceSpan } from "./parse";
import type { ExactTerm } from "./polynomial";
import { exponentKey, sortedTerms } from "./polynomial";
import { sign } from "../linalg/rational";

export interface NegativeCrossEffect {
  /** The variable whose equation holds the term. */
  equation: string;
  /** The expanded term as text, e.g. `-x*z`. */
  term: string;
  /** The written summands that produce the term (empty when the ODE has no source text). */
  spans: SourceSpan[];
  exact: ExactTerm;
}

export function negativeCrossEffects(ode: ExactOde, sources: readonly EquationSource[] = []): NegativeCrossEffect[] {
  return ode.rhs.flatMap((rhs, i) =>
    sortedTerms(rhs)
      .filter((t) => sign(t.coefficient) < 0 && t.exponents[i] === 0)
      .map((t) => ({
        equation: ode.variables[i],
        term: formatTerm(t, ode.variables),
        spans: sources[i]?.terms.get(exponentKey(t.exponents)) ?? [],
        exact: t,
      })),
  );
}
