// Sources: Hárs and Tóth (1979), "On the inverse problem of reaction kinetics" (kinetic iff no
// negative cross effect; the canonical realization); Lorenz (1963), Rössler (1976) and the
// Lotka–Volterra model as stated in any textbook of mathematical biology.
import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { odeArbitrary } from "../ode/arbitrary";
import { negativeCrossEffects } from "../ode/cross-effects";
import type { ExactOde } from "../ode/exact";
import { parseOde } from "../ode/parse";
import * as P from "../ode/polynomial";
import * as Q from "../linalg/rational";
import { multiplyByMonomial, productOfAllVariables, translate } from "../ode/transform";
import { canonicalRealization } from "./canonical";
import { inducedRhs, maxOrder } from "./mass-action";
import { buildNetwork } from "../network";
import { parseMechanism } from "../parse";
import { massActionOf } from "./from-network";
import { mechanismText } from "./weave-text";

const exactOf = (name: string) => parseOde(readFileSync(`tests/fixtures/ode/${name}`, "utf8")).exact!;
const effects = (ode: ExactOde) => negativeCrossEffects(ode).map(({ equation, term }) => ({ equation, term }));
const sameRhs = (a: P.Polynomial[], b: P.Polynomial[]) => a.length === b.length && a.every((p, i) => P.equals(p, b[i]));

describe("negative cross effects", () => {
  it("Lorenz: only -x*z in y' (in x' the negative term -10*x contains x, so it is no cross effect)", () => {
    expect(effects(exactOf("lorenz.ode"))).toEqual([{ equation: "y", term: "-x*z" }]);
  });

  it("Rössler: -y and -z in x'", () => {
    expect(effects(exactOf("rossler.ode"))).toEqual([
      { equation: "x", term: "-y" },
      { equation: "x", term: "-z" },
    ]);
  });

  it("Lotka–Volterra: none", () => {
    expect(effects(exactOf("lotka-volterra.ode"))).toEqual([]);
  });
});

describe("canonical realization", () => {
  it("Lotka–Volterra gives one step per term: X → 2X, X + Y → Y, X + Y → X + 2Y, Y → 0", () => {
    // The textbook scheme X + Y → 2Y merges the two middle steps; that is a different (sparser)
    // realization, found by the sparse search in milp.test.ts, not the canonical one.
    const text = mechanismText(canonicalRealization(exactOf("lotka-volterra.ode")), "canonical");
    expect(text.split("\n").slice(1, -1)).toEqual(["x + y -> y @ 0.5", "x -> 2x @ 2", "x + y -> x + 2y @ 0.5", "y -> 0 @ 3"]);
  });

  it("Lorenz translated into the positive orthant and multiplied by x*y*z is kinetic, of order five", () => {
    const shift = [30, 40, 10].map((v) => Q.rational(v)); // the attractor's box is about x ±20, y ±28, z 0..50
    const moved = translate(exactOf("lorenz.ode"), shift);
    expect(effects(moved).length).toBeGreaterThan(0); // translation alone leaves negative constants
    const ode = multiplyByMonomial(moved, productOfAllVariables(moved));
    expect(effects(ode)).toEqual([]);
    const mechanism = canonicalRealization(ode);
    expect(maxOrder(mechanism)).toBe(5);
    expect(sameRhs(inducedRhs(mechanism), ode.rhs)).toBe(true);
    expect(mechanism.reactions.length).toBe([...ode.rhs].reduce((n, p) => n + p.size, 0));

    // The mechanism text, read back by the language's own parser: its induced ODE has, term by
    // term, the transformed ODE's coefficients as the doubles the text carries (8/3 has no decimal).
    const read = parseMechanism(mechanismText(mechanism, "Lorenz, shifted and multiplied"));
    expect(read.diagnostics).toEqual([]);
    const asWritten = (p: P.Polynomial) => P.fromMonomials(P.toMonomials(p));
    expect(sameRhs(inducedRhs(massActionOf(buildNetwork(read.mechanism))), ode.rhs.map(asWritten))).toBe(true);
  });

  it("translation keeps beta = 8/3 exact: z' gains the constant (-30)*(-40) + 8/3*10", () => {
    const moved = translate(exactOf("lorenz.ode"), [30, 40, 10].map((v) => Q.rational(v)));
    expect(Q.toText(moved.rhs[2].get("0,0,0")!.coefficient)).toBe("3680/3");
  });

  it("for random kinetic ODEs the induced ODE of the canonical realization is the input (fast-check)", () => {
    fc.assert(
      fc.property(odeArbitrary({ kinetic: true }), (ode) => {
        expect(effects(ode)).toEqual([]);
        expect(sameRhs(inducedRhs(canonicalRealization(ode)), ode.rhs)).toBe(true);
      }),
    );
  });
});
