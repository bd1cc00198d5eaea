import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { simulateNetwork } from "~/chem/kinetics/simulate";
import type { Mechanism } from "~/chem/model";
import { buildNetwork } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";
import { mechanismAt, resolveParameters, valueOf } from "./parameters";
import { computeSensitivities, rankInfluence } from "./sensitivity";

function fixture(path: string): Mechanism {
  return parseMechanism(readFileSync(new URL(`../../../tests/fixtures/${path}`, import.meta.url), "utf8")).mechanism;
}

/** ∂ln x/∂ln p by central differences of two tight simulations at p·e^±h. */
function finiteDifference(mechanism: Mechanism, name: string, until: number, samples: number): Record<string, number[]> {
  const [parameter] = resolveParameters(mechanism, [name]);
  const value = valueOf(mechanism, parameter);
  const h = 1e-3;
  const [plus, minus] = [h, -h].map((step) => {
    const moved = mechanismAt(mechanism, [parameter], [value * Math.exp(step)]);
    return simulateNetwork(moved, buildNetwork(moved), { until, samples, rtol: 1e-9, atol: 1e-18, method: "rodas4" });
  });
  const centre = simulateNetwork(mechanism, buildNetwork(mechanism), { until, samples, rtol: 1e-9, atol: 1e-18, method: "rodas4" });
  return Object.fromEntries(
    Object.keys(centre.series).map((species) => [species, centre.series[species].map((x, i) => (plus.series[species][i] - minus.series[species][i]) / (2 * h) / x)]),
  );
}

function expectAgreement(mechanism: Mechanism, vary: string[], until: number): void {
  const samples = 21;
  const result = computeSensitivities(mechanism, { until, samples, vary, rtol: 1e-9, atol: 1e-14 });
  let compared = 0;
  for (const name of vary) {
    const reference = finiteDifference(mechanism, name, until, samples);
    for (const [species, values] of Object.entries(result.normalized)) {
      values[name].forEach((value, i) => {
        if (value === null || !Number.isFinite(reference[species][i]) || result.series[species][i] < 1e-9 * Math.max(...result.series[species])) return;
        // Relative where the sensitivity is large: the difference quotient's own error grows with it
        // (S nearly used up in Michaelis–Menten, ∂ln S/∂ln [E]0 ≈ −18: the reference is off by 8e-4 there).
        expect(Math.abs(value - reference[species][i]), `${species} by ${name} at t = ${result.t[i]}`).toBeLessThan(1e-3 * Math.max(1, Math.abs(reference[species][i])));
        compared++;
      });
    }
  }
  expect(compared).toBeGreaterThan(vary.length * 20);
}

describe("forward sensitivities against central finite differences", () => {
  it("agree to 1e-3 for Michaelis–Menten's rate coefficients and an initial concentration", () => {
    expectAgreement(fixture("michaelis-menten.weave"), ["kon", "koff", "kcat", "[S]0", "[E]0"], 200);
  });

  it("agree to 1e-3 for the temperature in Arrhenius-type expressions", () => {
    expectAgreement(fixture("dynamics/arrhenius.weave"), ["T"], 1e-2);
  });

  it("agree to 1e-3 for a parameter read by a custom rate law", () => {
    expectAgreement(fixture("dynamics/enzyme.weave"), ["v"], 20);
  });
});

describe("sensitivity requests", () => {
  it("differentiate by every named rate coefficient by default", () => {
    const result = computeSensitivities(fixture("michaelis-menten.weave"), { until: 1, samples: 3 });
    expect(result.parameters).toEqual(["kon", "koff", "kcat"]);
    expect(Object.keys(result.normalized.S)).toEqual(["kon", "koff", "kcat"]);
  });

  it("rank the parameters by their largest influence on a species", () => {
    const result = computeSensitivities(fixture("michaelis-menten.weave"), { until: 200, samples: 21 });
    const ranking = rankInfluence(result, "P");
    expect(ranking.map((r) => r.parameter)).toHaveLength(3);
    expect(ranking[0].peak).toBeGreaterThanOrEqual(ranking[1].peak);
    // Early on P grows as kcat·[C], and C is set by binding: ∂ln P/∂ln kcat peaks near 1.
    expect(ranking.find((r) => r.parameter === "kcat")?.peak).toBeGreaterThan(0.5);
    expect(() => rankInfluence(result, "Q")).toThrow(/"Q" is not a species/);
  });

  it("refuse an unknown parameter by name", () => {
    expect(() => computeSensitivities(fixture("michaelis-menten.weave"), { until: 1, samples: 3, vary: ["k9"] })).toThrow(/unknown parameter k9/);
    expect(() => computeSensitivities(fixture("michaelis-menten.weave"), { until: 1, samples: 3, vary: ["[Q]0"] })).toThrow(/no species Q/);
  });
});
