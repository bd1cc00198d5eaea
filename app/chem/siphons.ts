// Siphons and the persistence criterion. A siphon is a set of species that, once all absent, stays
// absent: every reaction producing one of them consumes one of them. Angeli, De Leenheer and
// Sontag (2007, Math. Biosci. 210) proved that if every minimal siphon contains the support of a
// non-negative conservation law, no species of a bounded trajectory with positive start dies out.
import { loadSolver } from "./conservation";
import { MAX_SIPHON_SEARCH_NODES } from "./limits";
import type { Network } from "./model";

export interface Persistence {
  /** Minimal siphons as sorted species indices, in lexicographic order; null when the search was cut short. */
  siphons: number[][] | null;
  /** Every minimal siphon contains the support of a non-negative conservation law. */
  criterionHolds: boolean | null;
  /** The siphons (indices into `siphons`) that contain no such support. */
  uncovered: number[];
  conclusion: string;
}

interface Flow {
  /** Species consumed (reactant complex's support). */
  consumed: number[];
  /** Species produced: net gain in the reaction vector, or present in the product and not consumed. */
  produced: number[];
}

/**
 * Every minimal siphon, by a branching search: a set that is not yet a siphon has a reaction that
 * produces one of its members and consumes none; one of that reaction's reactants must join.
 * Exponential in the worst case (the answer itself may be); each branch costs O(species ×
 * reactions), a branch dies when the largest siphon avoiding the excluded species does not hold
 * the included ones, and supersets of siphons already found are dropped. Null beyond
 * MAX_SIPHON_SEARCH_NODES branches.
 */
export function minimalSiphons(network: Network, nodeLimit = MAX_SIPHON_SEARCH_NODES): number[][] | null {
  const flows = siphonFlows(network);
  const speciesCount = network.species.length;
  const found: Set<number>[] = [];
  let nodes = 0;

  const search = (included: Set<number>, excluded: Set<number>): boolean => {
    if (++nodes > nodeLimit) return false;
    if (found.some((siphon) => isSubset(siphon, included))) return true;
    const allowed = new Set<number>();
    for (let s = 0; s < speciesCount; s++) if (!excluded.has(s)) allowed.add(s);
    const room = largestSiphonWithin(allowed, flows);
    if (![...included].every((s) => room.has(s))) return true;
    const open = flows.find(({ consumed, produced }) => produced.some((s) => included.has(s)) && !consumed.some((s) => included.has(s)));
    if (!open) {
      if (isMinimalSiphon(included, flows)) found.push(new Set(included));
      return true;
    }
    const tried = new Set(excluded);
    for (const reactant of open.consumed) {
      if (tried.has(reactant)) continue;
      if (!search(new Set([...included, reactant]), new Set(tried))) return false;
      tried.add(reactant);
    }
    return true;
  };

  const excluded = new Set<number>();
  for (let s = 0; s < speciesCount; s++) {
    // Siphons holding s but none of the species before it: each minimal siphon is found once, from its first species.
    if (!search(new Set([s]), new Set(excluded))) return null;
    excluded.add(s);
  }
  return found.map((siphon) => [...siphon].sort((a, b) => a - b)).sort(compareLexicographic);
}

/** Whether `set` is a siphon: no reaction produces a member without consuming one. */
export function isSiphon(set: Set<number>, network: Network): boolean {
  return set.size > 0 && isClosed(set, siphonFlows(network));
}

function siphonFlows(network: Network): Flow[] {
  return network.reactions.map(({ from, to }) => {
    const consumed = network.complexes[from].terms.map((term) => term.species);
    const produced = network.complexes[to].terms.map((term) => term.species).filter((s) => !consumed.includes(s));
    return { consumed, produced };
  });
}

function isClosed(set: Set<number>, flows: Flow[]): boolean {
  return flows.every(({ consumed, produced }) => !produced.some((s) => set.has(s)) || consumed.some((s) => set.has(s)));
}

/** The union of all siphons inside `set` (itself a siphon, or empty): drop what an open reaction produces until none is left. */
function largestSiphonWithin(set: Set<number>, flows: Flow[]): Set<number> {
  const result = new Set(set);
  for (let changed = true; changed; ) {
    changed = false;
    for (const { consumed, produced } of flows) {
      if (consumed.some((s) => result.has(s))) continue;
      for (const s of produced) changed = result.delete(s) || changed;
    }
  }
  return result;
}

/** A siphon is minimal when removing any one species leaves no siphon inside the rest. */
function isMinimalSiphon(siphon: Set<number>, flows: Flow[]): boolean {
  return [...siphon].every((species) => largestSiphonWithin(new Set([...siphon].filter((s) => s !== species)), flows).size === 0);
}

function isSubset(small: Set<number>, large: Set<number>): boolean {
  for (const item of small) if (!large.has(item)) return false;
  return true;
}

function compareLexicographic(a: number[], b: number[]): number {
  for (let i = 0; i < Math.min(a.length, b.length); i++) if (a[i] !== b[i]) return a[i] - b[i];
  return a.length - b.length;
}

/**
 * Whether some non-negative, nonzero combination of the conservation laws vanishes outside the
 * siphon: an LP over the laws' coefficients λ, with Σλ·law ≥ 0 inside, = 0 outside, summing to 1.
 */
export async function containsConservedSupport(siphon: number[], laws: number[][], speciesCount: number): Promise<boolean> {
  if (laws.length === 0) return false;
  const inside = new Set(siphon);
  const weight = (species: number) =>
    laws.map((law, k) => (law[species] === 0 ? "" : `${law[species] < 0 ? "-" : "+"} ${Math.abs(law[species])} l${k}`)).filter(Boolean).join(" ");
  const rows: string[] = [];
  for (let species = 0; species < speciesCount; species++) {
    const terms = weight(species);
    if (terms === "") continue;
    rows.push(` s${species}: ${terms} ${inside.has(species) ? ">=" : "="} 0`);
  }
  const total = siphon.map(weight).filter(Boolean).join(" ");
  if (total === "") return false;
  rows.push(` total: ${total} = 1`);
  const problem = ["Minimize", " obj: 0 l0", "Subject To", ...rows, "Bounds", ...laws.map((_, k) => ` l${k} free`), "End"].join("\n");
  const result = (await loadSolver()).solve(problem, { output_flag: false });
  return result.Status === "Optimal";
}

export async function persistence(network: Network, laws: number[][]): Promise<Persistence> {
  if (network.reactions.length === 0) {
    return { siphons: [], criterionHolds: null, uncovered: [], conclusion: "There are no reactions yet, so there is nothing to conclude." };
  }
  const siphons = minimalSiphons(network);
  if (siphons === null) {
    return {
      siphons: null,
      criterionHolds: null,
      uncovered: [],
      conclusion: `The search for minimal siphons stopped after ${MAX_SIPHON_SEARCH_NODES.toLocaleString("en")} branches: this network has too many to list, so the siphon criterion is undecided.`,
    };
  }
  if (siphons.length === 0) {
    return {
      siphons,
      criterionHolds: true,
      uncovered: [],
      conclusion: "There is no siphon: no set of species, once absent, must stay absent. No species of a bounded trajectory that starts with every concentration positive dies out (Angeli, De Leenheer and Sontag 2007).",
    };
  }
  const uncovered: number[] = [];
  for (const [index, siphon] of siphons.entries()) {
    if (!(await containsConservedSupport(siphon, laws, network.species.length))) uncovered.push(index);
  }
  const names = (index: number) => `{${siphons[index].map((s) => network.species[s]).join(", ")}}`;
  const conclusion =
    uncovered.length === 0
      ? `Every minimal siphon (${siphons.length}) contains the support of a non-negative conservation law, so its total can never reach 0 from a positive start. Hence no species of a bounded trajectory that starts with every concentration positive dies out: the network is persistent (Angeli, De Leenheer and Sontag 2007), whatever the rate coefficients.`
      : `The siphon criterion does not hold: ${uncovered.map(names).join(", ")} ${uncovered.length === 1 ? "contains" : "contain"} the support of no non-negative conservation law. Once such a set is empty it stays empty, and nothing here rules out approaching that, so some species may die out; the criterion is sufficient, not necessary, so this is not a proof that they do.`;
  return { siphons, criterionHolds: uncovered.length === 0, uncovered, conclusion };
}
