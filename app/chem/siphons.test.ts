import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Network } from "./model";
import { buildNetwork } from "./network";
import { parseMechanism } from "./parse";
import { containsConservedSupport, isSiphon, minimalSiphons, persistence } from "./siphons";
import { nullSpace } from "./linalg/kernel";
import { reactionVector } from "./network";

const networkOf = (text: string) => buildNetwork(parseMechanism(text).mechanism);
const lawsOf = (network: Network) => nullSpace(network.reactions.map((reaction) => reactionVector(network, reaction)), network.species.length);

/** Every minimal siphon by trying all 2^n sets: the definition, with no search. */
function bruteForceMinimalSiphons(network: Network): number[][] {
  const n = network.species.length;
  const siphons: number[][] = [];
  for (let mask = 1; mask < 1 << n; mask++) {
    const set = new Set<number>();
    for (let s = 0; s < n; s++) if (mask & (1 << s)) set.add(s);
    if (isSiphon(set, network)) siphons.push([...set]);
  }
  const minimal = siphons.filter((siphon) => !siphons.some((other) => other.length < siphon.length && other.every((s) => siphon.includes(s))));
  return minimal.sort((a, b) => a.join(",").localeCompare(b.join(",")));
}

const lexicographic = (sets: number[][]) => [...sets].sort((a, b) => a.join(",").localeCompare(b.join(",")));

describe("minimal siphons", () => {
  it("Michaelis–Menten E + S ⇌ C → E + P: {E, C} and {S, C} — P, never consumed, is in no minimal one (worked by hand from the definition)", () => {
    const network = networkOf("E + S <=> C @ 1, 1\nC -> E + P @ 1\n");
    expect(network.species).toEqual(["E", "S", "C", "P"]);
    expect(minimalSiphons(network)).toEqual([[0, 2], [1, 2]]);
  });

  it("an inflow makes no siphon of what it feeds: 0 → A, A → B has none", () => {
    expect(minimalSiphons(networkOf("0 -> A @ 1\nA -> B @ 1\n"))).toEqual([]);
  });

  it("agrees with trying every subset on random small networks (property)", () => {
    const complex = fc.array(fc.integer({ min: 0, max: 2 }), { minLength: 6, maxLength: 6 });
    const reactionArb = fc.tuple(complex, complex);
    fc.assert(
      fc.property(fc.array(reactionArb, { minLength: 1, maxLength: 7 }), (pairs) => {
        const names = ["A", "B", "C", "D", "E", "F"];
        const side = (counts: number[]) => counts.flatMap((count, s) => (count === 0 ? [] : [`${count === 1 ? "" : count}${names[s]}`])).join(" + ") || "0";
        const text = pairs.map(([from, to]) => `${side(from)} -> ${side(to)} @ 1`).join("\n") + "\n";
        const network = networkOf(text);
        expect(lexicographic(minimalSiphons(network)!)).toEqual(bruteForceMinimalSiphons(network));
      }),
      { numRuns: 300, seed: 18 },
    );
  });

  it("says so when the search runs past its work limit", () => {
    // Thirty disjoint pairs Ai ⇌ Bi: each pair is a minimal siphon, and ten branches cannot reach them all.
    const text = Array.from({ length: 30 }, (_, i) => `A${i} <=> B${i} @ 1, 1`).join("\n") + "\n";
    expect(minimalSiphons(networkOf(text))).toHaveLength(30);
    expect(minimalSiphons(networkOf(text), 100)).toBeNull();
  });

  it("stays fast at a few hundred species: a 300-species chain of enzyme steps", () => {
    const lines = Array.from({ length: 100 }, (_, i) => `E${i} + S${i} <=> C${i} @ 1, 1\nC${i} -> E${i} + S${i + 1} @ 1`);
    const network = networkOf(lines.join("\n") + "\n");
    expect(network.species.length).toBeGreaterThan(300);
    const started = performance.now();
    const siphons = minimalSiphons(network)!;
    expect(performance.now() - started).toBeLessThan(2000);
    // One {Ei, Ci} per enzyme, and the substrate chain {S0 … S99, C0 … C99} (S100, never consumed, is in none).
    expect(siphons).toHaveLength(101);
  });
});

describe("the siphon criterion", () => {
  it("Michaelis–Menten with the product recycled (P → S) is persistent: both siphons hold a conserved total", async () => {
    const network = networkOf("E + S <=> C @ 1, 1\nC -> E + P @ 1\nP -> S @ 1\n");
    const verdict = await persistence(network, lawsOf(network));
    expect(verdict.criterionHolds).toBe(true);
    expect(verdict.conclusion).toMatch(/persistent/);
  });

  it("A + B → 2B with no way back: {B} holds no conserved support, the criterion fails", async () => {
    const network = networkOf("A + B -> 2B @ 1\nB -> C @ 1\n");
    const verdict = await persistence(network, lawsOf(network));
    expect(verdict.criterionHolds).toBe(false);
    expect(verdict.uncovered.map((index) => verdict.siphons![index].map((s) => network.species[s]))).toContainEqual(["B"]);
  });

  it("finds a non-negative combination of laws that are not themselves non-negative", async () => {
    // Laws A − C and B + C: their sum A + B is non-negative and lies in the siphon {A, B}.
    expect(await containsConservedSupport([0, 1], [[1, 0, -1], [0, 1, 1]], 3)).toBe(true);
    expect(await containsConservedSupport([0], [[1, 0, -1], [0, 1, 1]], 3)).toBe(false);
  });
});
