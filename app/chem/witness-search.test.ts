import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "./analysis";
import { parseMechanism } from "./parse";
import { searchWitness } from "./witness-search";

const twoSite = readFileSync(new URL("../../tests/fixtures/two-site-phosphorylation.weave", import.meta.url), "utf8");

/** dX/dt at a state from the steps' text alone (mass action, one rate per directed reaction), relative to the largest rate. */
function residualByHand(species: string[], reactions: { from: Record<string, number>; to: Record<string, number> }[], rates: number[], state: Record<string, number>) {
  const f = Object.fromEntries(species.map((name) => [name, 0]));
  let largest = 0;
  reactions.forEach(({ from, to }, r) => {
    const rate = Object.entries(from).reduce((product, [name, n]) => product * state[name] ** n, rates[r]);
    largest = Math.max(largest, rate);
    for (const [name, n] of Object.entries(from)) f[name] -= n * rate;
    for (const [name, n] of Object.entries(to)) f[name] += n * rate;
  });
  return Math.max(...Object.values(f).map(Math.abs)) / largest;
}

describe("the witness search as a job", () => {
  it("two-site phosphorylation (Markevich et al. 2004; Conradi et al. 2008): the analysis on every change finds no witness, the job finds one that verifies", async () => {
    const onChange = await analyzeSource(twoSite);
    expect(onChange.multistationarity).toMatchObject({ verdict: "possible", reason: expect.stringMatching(/witness search takes longer/) });
    expect(onChange.multistationarity.witness).toBeUndefined();

    const progress: number[] = [];
    const { mechanism } = parseMechanism(twoSite);
    const result = await searchWitness(mechanism, { budgetMs: 20_000, onProgress: (fraction) => progress.push(fraction) });
    const witness = result.multistationarity.witness!;
    expect(witness.equilibria.length).toBeGreaterThanOrEqual(2);
    expect(result.checks).toHaveLength(witness.equilibria.length);
    expect(progress.every((fraction) => fraction >= 0 && fraction <= 1)).toBe(true);

    // Checked from the report's complexes, not the library's network: each residual small, totals shared.
    const complexes = onChange.complexes.map((text) =>
      Object.fromEntries(text === "0" ? [] : text.split(" + ").map((term) => { const m = /^(\d*)(.+)$/.exec(term)!; return [m[2], Number(m[1] || 1)]; })),
    );
    const reactions = onChange.reactions.map(({ from, to }) => ({ from: complexes[from], to: complexes[to] }));
    for (const [k, state] of witness.equilibria.entries()) {
      expect(Object.values(state).every((value) => value > 0)).toBe(true);
      const byHand = residualByHand(result.species, reactions, witness.rates, state);
      expect(byHand).toBeLessThan(1e-8);
      expect(result.checks[k].residual).toBeCloseTo(byHand, 12);
      result.checks[k].totals.forEach((total, law) => expect(total).toBeCloseTo(result.checks[0].totals[law], 6));
    }
    // The totals of S, E and F (three conservation laws) are what the states share.
    expect(result.conservationLaws).toHaveLength(3);
  }, 60_000);
});
