import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { odeArbitrary } from "./arbitrary";
import { formatOde } from "./format";
import { parseOde } from "./parse";
import * as P from "./polynomial";
import * as Q from "../linalg/rational";
import { negativeCrossEffects } from "./cross-effects";
import { multiplyByMonomial, productOfAllVariables, smallestMultiplier, translate } from "./transform";

const sameOde = (a: ReturnType<typeof parseOde>["exact"], b: ReturnType<typeof parseOde>["exact"]) =>
  a!.rhs.every((p, i) => P.equals(p, b!.rhs[i])) && a!.initial.every((v, i) => Q.equals(v, b!.initial[i]));

describe("ODE text", () => {
  it("formatOde writes what parseOde reads back exactly (fast-check)", () => {
    fc.assert(
      fc.property(odeArbitrary(), (ode) => {
        const back = parseOde(formatOde(ode));
        expect(back.diagnostics).toEqual([]);
        expect(sameOde(back.exact, ode)).toBe(true);
      }),
    );
  });

  it("translating by s and then by −s gives the ODE back (fast-check)", () => {
    fc.assert(
      fc.property(odeArbitrary({ maxTerms: 6 }), fc.array(fc.integer({ min: -9, max: 9 }), { minLength: 3, maxLength: 3 }), (ode, s) => {
        const there = translate(ode, s.map((v) => Q.rational(v, 2)));
        expect(sameOde(translate(there, s.map((v) => Q.rational(-v, 2))), ode)).toBe(true);
      }),
      { numRuns: 50 },
    );
  });

  it("any translated ODE times the product of its variables, or times the smallest multiplier, is kinetic (fast-check)", () => {
    fc.assert(
      fc.property(odeArbitrary({ maxTerms: 8 }), fc.array(fc.integer({ min: -9, max: 9 }), { minLength: 3, maxLength: 3 }), (ode, s) => {
        const moved = translate(ode, s.map((v) => Q.rational(v)));
        expect(negativeCrossEffects(multiplyByMonomial(moved, productOfAllVariables(moved)))).toEqual([]);
        expect(negativeCrossEffects(multiplyByMonomial(moved, smallestMultiplier(moved)))).toEqual([]);
      }),
      { numRuns: 50 },
    );
  });
});
