import { describe, expect, it } from "vitest";
import { simulateNetwork } from "~/chem/kinetics/simulate";
import { buildNetwork } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";
import { ratesOfProduction } from "./rates-of-production";

describe("rates of production", () => {
  const { mechanism } = parseMechanism("bind: E + S <=> C @ kon = 10, koff = 1\ncat: C -> E + P @ 2\n0 -> S @ { v * S0 }\nv = 0.1\nS0 = 2\n[E]0 = 0.1\n[S]0 = 1\n");
  const network = buildNetwork(mechanism);
  const run = simulateNetwork(mechanism, network, { until: 5, samples: 51, rtol: 1e-10, atol: 1e-14 });

  it("splits d[S]/dt into each reaction's ν·rate, ranked by size, summing to the derivative", () => {
    const i = 20;
    const result = ratesOfProduction(mechanism, network, run, "S", run.t[i]);
    const [E, S, C] = [run.series.E[i], run.series.S[i], run.series.C[i]];
    const expected = { "E + S -> C": -10 * E * S, "C -> E + S": 1 * C, "0 -> S": 0.1 * 2 };
    expect(result.contributions.map((c) => c.reaction).sort()).toEqual(Object.keys(expected).sort());
    for (const c of result.contributions) expect(c.contribution).toBeCloseTo(expected[c.reaction as keyof typeof expected], 12);
    const sizes = result.contributions.map((c) => Math.abs(c.contribution));
    expect(sizes).toEqual([...sizes].sort((a, b) => b - a));
    expect(result.total).toBeCloseTo(-10 * E * S + C + 0.2, 12);
    expect(result.contributions.find((c) => c.reaction === "E + S -> C")?.steps).toEqual(["bind"]);
    expect(result.contributions.find((c) => c.reaction === "0 -> S")?.steps).toEqual(["line 3"]);
  });

  it("leaves out reactions that do not change the species, and refuses unknown species and times", () => {
    expect(ratesOfProduction(mechanism, network, run, "P", 1).contributions.map((c) => c.reaction)).toEqual(["C -> E + P"]);
    expect(() => ratesOfProduction(mechanism, network, run, "Q", 1)).toThrow(/"Q" is not a species/);
    expect(() => ratesOfProduction(mechanism, network, run, "S", 9)).toThrow(/outside/);
  });
});
