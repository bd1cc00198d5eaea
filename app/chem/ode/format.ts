// Writes exact polynomials back as `.ode` text that parseOde reads to the same exact values.
import type { ExactOde } from "./exact";
import type { ExactTerm, Polynomial } from "./polynomial";
import { sortedTerms } from "./polynomial";
import * as Q from "../linalg/rational";

export function formatMonomial(exponents: readonly number[], variables: readonly string[]): string {
  return exponents.flatMap((e, i) => (e === 0 ? [] : [e === 1 ? variables[i] : `${variables[i]}^${e}`])).join("*");
}

/** One term with its sign: `-x*z`, `28*x`, `-8/3*z`, `5`. */
export function formatTerm(term: ExactTerm, variables: readonly string[]): string {
  const monomial = formatMonomial(term.exponents, variables);
  const magnitude = Q.abs(term.coefficient);
  const sign = Q.sign(term.coefficient) < 0 ? "-" : "";
  if (!monomial) return sign + Q.toText(magnitude);
  return sign + (Q.equals(magnitude, Q.ONE) ? monomial : `${Q.toText(magnitude)}*${monomial}`);
}

export function formatPolynomial(p: Polynomial, variables: readonly string[]): string {
  const terms = sortedTerms(p).map((t) => formatTerm(t, variables));
  if (terms.length === 0) return "0";
  return terms.map((t, k) => (k === 0 ? t : t.startsWith("-") ? `- ${t.slice(1)}` : `+ ${t}`)).join(" ");
}

export function formatOde(ode: ExactOde): string {
  const equations = ode.variables.map((v, i) => `${v}' = ${formatPolynomial(ode.rhs[i], ode.variables)}`);
  const initial = ode.variables.flatMap((v, i) => (Q.isZero(ode.initial[i]) ? [] : [`${v}(0) = ${Q.toText(ode.initial[i])}`]));
  return [...equations, ...initial].join("\n") + "\n";
}
