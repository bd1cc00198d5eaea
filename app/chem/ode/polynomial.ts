// Exact multivariate polynomials: a map from exponent vector to a non-zero rational coefficient.
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";
import type { Monomial } from "../model";

export interface ExactTerm {
  exponents: number[];
  coefficient: Rational;
}

/** Keyed by the exponent vector joined with commas; zero coefficients are never stored. */
export type Polynomial = ReadonlyMap<string, ExactTerm>;

export const exponentKey = (exponents: readonly number[]) => exponents.join(",");

export function fromTerms(terms: Iterable<ExactTerm>): Polynomial {
  const sum = new Map<string, ExactTerm>();
  for (const term of terms) {
    const key = exponentKey(term.exponents);
    const coefficient = Q.add(sum.get(key)?.coefficient ?? Q.ZERO, term.coefficient);
    if (Q.isZero(coefficient)) sum.delete(key);
    else sum.set(key, { exponents: [...term.exponents], coefficient });
  }
  return sum;
}

export const zero = (): Polynomial => new Map();

export function constant(variableCount: number, value: Rational): Polynomial {
  return fromTerms([{ exponents: new Array(variableCount).fill(0), coefficient: value }]);
}

export function variable(variableCount: number, index: number): Polynomial {
  const exponents = new Array(variableCount).fill(0);
  exponents[index] = 1;
  return fromTerms([{ exponents, coefficient: Q.ONE }]);
}

export const add = (a: Polynomial, b: Polynomial) => fromTerms([...a.values(), ...b.values()]);

export function scale(a: Polynomial, factor: Rational): Polynomial {
  return fromTerms([...a.values()].map((t) => ({ exponents: t.exponents, coefficient: Q.mul(t.coefficient, factor) })));
}

export const sub = (a: Polynomial, b: Polynomial) => add(a, scale(b, Q.neg(Q.ONE)));

export function mul(a: Polynomial, b: Polynomial): Polynomial {
  const products: ExactTerm[] = [];
  for (const s of a.values()) {
    for (const t of b.values()) {
      products.push({
        exponents: s.exponents.map((e, i) => e + t.exponents[i]),
        coefficient: Q.mul(s.coefficient, t.coefficient),
      });
    }
  }
  return fromTerms(products);
}

export function power(a: Polynomial, exponent: number, variableCount: number): Polynomial {
  let result = constant(variableCount, Q.ONE);
  for (let k = 0; k < exponent; k++) result = mul(result, a);
  return result;
}

/** The value if the polynomial has no variable in it (the zero polynomial gives 0), else null. */
export function constantValue(a: Polynomial): Rational | null {
  if (a.size === 0) return Q.ZERO;
  if (a.size > 1) return null;
  const [term] = a.values();
  return term.exponents.every((e) => e === 0) ? term.coefficient : null;
}

export function equals(a: Polynomial, b: Polynomial): boolean {
  if (a.size !== b.size) return false;
  for (const [key, term] of a) {
    const other = b.get(key);
    if (!other || !Q.equals(other.coefficient, term.coefficient)) return false;
  }
  return true;
}

export const totalDegree = (exponents: readonly number[]) => exponents.reduce((s, e) => s + e, 0);

/** Terms in a stable reading order: higher total degree first, then by exponents. */
export function sortedTerms(a: Polynomial): ExactTerm[] {
  return [...a.values()].sort(
    (s, t) =>
      totalDegree(t.exponents) - totalDegree(s.exponents) ||
      (t.exponents.map((e, i) => e - s.exponents[i]).find((d) => d !== 0) ?? 0),
  );
}

export function toMonomials(a: Polynomial): Monomial[] {
  return sortedTerms(a).map((t) => ({ coefficient: Q.toNumber(t.coefficient), exponents: [...t.exponents] }));
}

export function fromMonomials(monomials: readonly Monomial[]): Polynomial {
  return fromTerms(monomials.map((m) => ({ exponents: m.exponents, coefficient: Q.fromNumber(m.coefficient) })));
}
