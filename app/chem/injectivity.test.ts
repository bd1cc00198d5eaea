import fc from "fast-check";
import { det } from "mathjs";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { determinantMatrix, determinantSigns, determinantTerms, integerDeterminant } from "./injectivity";
import { nullSpace } from "./linalg/kernel";
import type { Network } from "./model";
import { buildNetwork, reactionVector } from "./network";
import { parseMechanism } from "./parse";
import { seededRandom } from "./seeded-random";

const networkOf = (text: string) => buildNetwork(parseMechanism(text).mechanism);
const lawsOf = (network: Network) => nullSpace(network.reactions.map((reaction) => reactionVector(network, reaction)), network.species.length);

// Distributive two-site phosphorylation by one kinase E and one phosphatase F (Markevich et al. 2004).
const twoSitePhosphorylation = readFileSync(new URL("../../tests/fixtures/two-site-phosphorylation.weave", import.meta.url), "utf8");

/** The expansion's value at (κ, x): Σ coefficient · κ^R · x^(Σ y_r − e_J). */
function expansionValue(network: Network, laws: number[][], rates: number[], x: number[]): number {
  let total = 0;
  for (const { reactions, species, coefficient } of determinantTerms(network, laws)) {
    let term = coefficient;
    for (const r of reactions) {
      term *= rates[r];
      for (const { species: s, coefficient: power } of network.complexes[network.reactions[r].from].terms) term *= x[s] ** power;
    }
    for (const s of species) term /= x[s];
    total += term;
  }
  return total;
}

describe("the determinant of the Jacobian with conservation laws put in", () => {
  it("A + B ⇌ C: −κ₂ − κ₁[A] − κ₁[B], one sign, that of (−1)^rank (worked by hand)", () => {
    const network = networkOf("A + B <=> C @ 1, 1\n");
    const signs = determinantSigns(network, lawsOf(network));
    expect(signs).toMatchObject({ kind: "expanded", positive: 0, negative: 3, expectedSign: -1, pivots: [0, 1] });
  });

  it("equals mathjs's determinant of the numeric matrix at random points, on random networks (Schwartz–Zippel)", () => {
    const species = fc.constantFrom("A", "B", "C", "D");
    const complex = fc
      .array(fc.tuple(fc.integer({ min: 1, max: 2 }), species), { maxLength: 2 })
      .map((terms) => (terms.length === 0 ? "0" : terms.map(([n, s]) => `${n}${s}`).join(" + ")));
    const step = fc.tuple(complex, complex).map(([l, r]) => `${l} -> ${r} @ 1`);
    fc.assert(
      fc.property(fc.array(step, { minLength: 1, maxLength: 6 }), fc.integer({ min: 1, max: 1e6 }), (steps, seed) => {
        const network = networkOf(steps.join("\n") + "\n");
        if (network.species.length === 0) return;
        const laws = lawsOf(network);
        const random = seededRandom(seed);
        const rates = network.reactions.map(() => 0.5 + random());
        const x = network.species.map(() => 0.5 + random());
        const expected = det(determinantMatrix(network, laws, rates, x)) as number;
        expect(expansionValue(network, laws, rates, x)).toBeCloseTo(expected, 8);
      }),
      { numRuns: 200, seed: 2013 },
    );
  });

  it("two-site phosphorylation has terms of both signs (Conradi et al. 2008: it can be multistationary)", () => {
    const network = networkOf(twoSitePhosphorylation);
    const signs = determinantSigns(network, lawsOf(network));
    expect(signs.kind).toBe("expanded");
    if (signs.kind !== "expanded") return;
    expect(signs.positive).toBeGreaterThan(0);
    expect(signs.negative).toBeGreaterThan(0);
    const rates = network.reactions.map((_, r) => 1 + r / 10);
    const x = network.species.map((_, s) => 1 + s / 7);
    expect(expansionValue(network, lawsOf(network), rates, x)).toBeCloseTo(det(determinantMatrix(network, lawsOf(network), rates, x)) as number, 6);
  });

  it("refuses beyond the term limit rather than running for minutes", () => {
    const network = networkOf(twoSitePhosphorylation);
    expect(determinantSigns(network, lawsOf(network), 1000)).toEqual({ kind: "too-large", terms: 924 * 84 });
  });

  it("integer determinants are exact (against mathjs on small integer matrices)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5 }).chain((n) => fc.array(fc.array(fc.integer({ min: -3, max: 3 }), { minLength: n, maxLength: n }), { minLength: n, maxLength: n })), (matrix) => {
        expect(integerDeterminant(matrix) + 0).toBe(Math.round(det(matrix) as number) + 0);
      }),
      { numRuns: 300, seed: 5 },
    );
  });
});
