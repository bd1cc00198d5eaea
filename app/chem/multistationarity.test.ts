import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "./analysis";
import { nullSpace } from "./linalg/kernel";
import { fluxSolver, hasPositiveFlux, multistationarity } from "./multistationarity";
import { buildNetwork, reactionVector } from "./network";
import { parseMechanism } from "./parse";

const fixture = (name: string) => readFileSync(new URL(`../../tests/fixtures/${name}`, import.meta.url), "utf8");

async function verdictOf(text: string) {
  const report = await analyzeSource(text);
  const network = buildNetwork(parseMechanism(text).mechanism);
  return { network, verdict: await multistationarity(network, report, { ms: 3000 }) };
}

/** The mass-action right-hand side at a state, computed here from the report's reactions alone. */
function residual(text: string, rates: number[], state: Record<string, number>) {
  const network = buildNetwork(parseMechanism(text).mechanism);
  const f: Record<string, number> = Object.fromEntries(network.species.map((name) => [name, 0]));
  let largest = 0;
  network.reactions.forEach((reaction, r) => {
    const rate = network.complexes[reaction.from].terms.reduce((product, { species, coefficient }) => product * state[network.species[species]] ** coefficient, rates[r]);
    largest = Math.max(largest, rate);
    const { indices, values } = reactionVector(network, reaction);
    indices.forEach((s, k) => (f[network.species[s]] += values[k] * rate));
  });
  return Math.max(...Object.values(f).map(Math.abs)) / largest;
}

describe("multistationarity", () => {
  it("two-site phosphorylation (Markevich et al. 2004; Conradi et al. 2008): possible, with a witness anyone can check", async () => {
    const text = fixture("two-site-phosphorylation.weave");
    const { network, verdict } = await verdictOf(text);
    expect(verdict.verdict).toBe("possible");
    expect(verdict.witness).toBeDefined();
    const { rates, equilibria } = verdict.witness!;
    expect(rates).toHaveLength(network.reactions.length);
    expect(equilibria.length).toBeGreaterThanOrEqual(2);
    const laws = nullSpace(network.reactions.map((reaction) => reactionVector(network, reaction)), network.species.length);
    const totals = (state: Record<string, number>) => laws.map((law) => law.reduce((sum, weight, s) => sum + weight * state[network.species[s]], 0));
    for (const state of equilibria) {
      expect(Object.values(state).every((value) => value > 0)).toBe(true);
      expect(residual(text, rates, state)).toBeLessThan(1e-8);
      totals(state).forEach((total, k) => expect(total).toBeCloseTo(totals(equilibria[0])[k], 6));
    }
    expect(equilibria[0]).not.toEqual(equilibria[1]);
  });

  it("excluded by a deficiency theorem when one applies (Michaelis–Menten: deficiency 0)", async () => {
    const { verdict } = await verdictOf(fixture("michaelis-menten.weave"));
    expect(verdict).toMatchObject({ verdict: "excluded", reason: expect.stringMatching(/Deficiency Zero Theorem/) });
  });

  it("excluded by injectivity where no deficiency theorem speaks (deficiency 2; determinant κ₁κ₃[C], worked by hand)", async () => {
    // With C conserved: rows A, B of the Jacobian and the law C = const give det = κ₁κ₃[C], one term.
    const text = "B + C -> C @ 1\nB + C -> A + C @ 1\nA -> B @ 1\n0 -> B @ 1\n";
    const { verdict } = await verdictOf(text);
    expect(verdict.reason).not.toMatch(/Deficiency/);
    expect(verdict).toMatchObject({ verdict: "excluded", reason: expect.stringMatching(/injective/) });
  });

  it("excluded when no positive flux exists at all (A → B, 2B → A + C: C only accumulates)", async () => {
    const network = buildNetwork(parseMechanism("A -> B @ 1\n2B -> A + C @ 1\n").mechanism);
    const verdict = await multistationarity(network, {
      theorems: { deficiencyZero: { applies: false, conclusion: "" }, deficiencyOne: { applies: false, conclusion: "" } },
      weaklyReversible: false,
      conservationLaws: [],
    });
    expect(verdict.verdict).toBe("excluded");
  });

  it("the shortcuts for a positive flux (weak reversibility, a one-way species) agree with the LP on random small networks (property)", async () => {
    const complex = fc.array(fc.integer({ min: 0, max: 2 }), { minLength: 4, maxLength: 4 });
    const networks = fc.sample(fc.array(fc.tuple(complex, complex), { minLength: 1, maxLength: 7 }), { numRuns: 300, seed: 16 });
    const names = ["A", "B", "C", "D"];
    const side = (counts: number[]) => counts.flatMap((count, s) => (count === 0 ? [] : [`${count === 1 ? "" : count}${names[s]}`])).join(" + ") || "0";
    for (const pairs of networks) {
      const text = pairs.map(([from, to]) => `${side(from)} -> ${side(to)} @ 1`).join("\n") + "\n";
      const { mechanism } = parseMechanism(text);
      const network = buildNetwork(mechanism);
      if (network.reactions.length === 0) continue;
      const { weaklyReversible } = await analyzeSource(text);
      const ones = network.reactions.map(() => 1);
      const byLp = (await fluxSolver(network))(ones, ones) !== null;
      expect(await hasPositiveFlux(network, weaklyReversible), text).toBe(byLp);
    }
  });
});
