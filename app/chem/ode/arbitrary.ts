// fast-check generators of exact polynomial ODEs, shared by the property tests.
import fc from "fast-check";
import type { ExactOde } from "./exact";
import * as P from "./polynomial";
import * as Q from "../linalg/rational";

export const VARIABLES = ["a", "b", "c"];

const rationalArbitrary = fc
  .record({ num: fc.integer({ min: -60, max: 60 }).filter((v) => v !== 0), den: fc.integer({ min: 1, max: 12 }) })
  .map(({ num, den }) => Q.rational(num, den));

const termArbitrary = fc.record({
  equation: fc.integer({ min: 0, max: VARIABLES.length - 1 }),
  exponents: fc.array(fc.integer({ min: 0, max: 3 }), { minLength: VARIABLES.length, maxLength: VARIABLES.length }),
  coefficient: rationalArbitrary,
});

/** Random ODEs; with `kinetic`, a negative term in x_i' is given a factor x_i so none is a cross effect. */
export function odeArbitrary({ kinetic = false, maxTerms = 12 } = {}): fc.Arbitrary<ExactOde> {
  return fc.tuple(fc.array(termArbitrary, { maxLength: maxTerms }), fc.array(rationalArbitrary, { minLength: 3, maxLength: 3 })).map(([terms, initial]) => {
    const rhs = VARIABLES.map((_, i) =>
      P.fromTerms(
        terms
          .filter((t) => t.equation === i)
          .map((t) => ({
            exponents: kinetic && Q.sign(t.coefficient) < 0 && t.exponents[i] === 0 ? t.exponents.map((e, j) => (j === i ? 1 : e)) : t.exponents,
            coefficient: t.coefficient,
          })),
      ),
    );
    return { variables: [...VARIABLES], rhs, initial };
  });
}
