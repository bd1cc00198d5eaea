// Siphons and the persistence criterion. A siphon is a set of species that, once all absent, stays
// absent: every reaction producing one of them consumes one of them. Angeli, De Leenheer and
// Sontag (2007, Math. Biosci. 210) proved that if every minimal siphon contains the support of a
// non-negative conservation law, no species of a bounded trajectory with positive start dies out.
import { loadSolver } from "./conservation";
import { MAX_SIPHON_SEARCH_WORK } from "./limits";
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
  /** Species produced and not consumed: the ones whose presence the reaction can restore. */
  produced: number[];
}

const FREE = 0;
const IN = 1;
const OUT = 2;

/**
 * Every minimal siphon, by a branching search: a set that is not yet a siphon has a reaction that
 * produces one of its members and consumes none; one of that reaction's reactants must join. The
 * branch taken is the open reaction with the fewest reactants still allowed (one: no branching at
 * all), a branch dies when the largest siphon avoiding the excluded species does not hold the
 * included ones, and supersets of siphons already found are dropped. Exponential in the worst case
 * (the answer itself may be); each branch costs O(size of the network). Null when the work passes
 * MAX_SIPHON_SEARCH_WORK reactant visits.
 */
export function minimalSiphons(network: Network, workLimit = MAX_SIPHON_SEARCH_WORK): number[][] | null {
  const flows = siphonFlows(network);
  const speciesCount = network.species.length;
  const consumers: number[][] = network.species.map(() => []);
  flows.forEach(({ consumed }, f) => consumed.forEach((s) => consumers[s].push(f)));
  const budget = { left: workLimit };
  const found: number[][] = [];
  const state = new Uint8Array(speciesCount);

  // Species outside every siphon never join one.
  const everywhere = largestSiphonWithin(state, flows, consumers, budget);
  for (let s = 0; s < speciesCount; s++) if (!everywhere[s]) state[s] = OUT;

  const search = (): boolean => {
    budget.left -= found.length;
    if (budget.left < 0) return false;
    if (found.some((siphon) => siphon.every((s) => state[s] === IN))) return true;
    const room = largestSiphonWithin(state, flows, consumers, budget);
    for (let s = 0; s < speciesCount; s++) if (state[s] === IN && !room[s]) return true;
    let branch: number[] | null = null;
    for (const { consumed, produced } of flows) {
      if (!produced.some((s) => state[s] === IN) || consumed.some((s) => state[s] === IN)) continue;
      const allowed = consumed.filter((s) => state[s] === FREE);
      budget.left -= consumed.length + produced.length;
      if (branch === null || allowed.length < branch.length) branch = allowed;
      if (allowed.length <= 1) break;
    }
    if (branch === null) {
      const members = state.reduce<number[]>((list, value, s) => (value === IN ? [...list, s] : list), []);
      if (isMinimalSiphon(members, state.length, flows, consumers, budget)) found.push(members);
      return true;
    }
    const changed: number[] = [];
    let complete = true;
    for (const reactant of branch) {
      state[reactant] = IN;
      complete = search();
      state[reactant] = OUT; // later branches avoid it: each siphon is found along one path only
      changed.push(reactant);
      if (!complete) break;
    }
    for (const s of changed) state[s] = FREE;
    return complete;
  };

  for (let s = 0; s < speciesCount; s++) {
    if (state[s] === OUT) continue;
    // Siphons holding s but none of the species before it: each minimal siphon is found from its first species.
    state[s] = IN;
    if (!search()) return null;
    state[s] = OUT;
  }
  return found.sort(compareLexicographic);
}

/** Whether `set` is a siphon: no reaction produces a member without consuming one. */
export function isSiphon(set: Set<number>, network: Network): boolean {
  return set.size > 0 && siphonFlows(network).every(({ consumed, produced }) => !produced.some((s) => set.has(s)) || consumed.some((s) => set.has(s)));
}

function siphonFlows(network: Network): Flow[] {
  return network.reactions.map(({ from, to }) => {
    const consumed = network.complexes[from].terms.map((term) => term.species);
    const produced = network.complexes[to].terms.map((term) => term.species).filter((s) => !consumed.includes(s));
    return { consumed, produced };
  });
}

/**
 * The union of all siphons among the species not marked OUT (itself a siphon, or empty): a
 * reaction none of whose reactants remain drops what it produces, until no such reaction is left.
 * Linear in the network's size, with a count per reaction of its reactants still in.
 */
function largestSiphonWithin(state: Uint8Array, flows: Flow[], consumers: number[][], budget: { left: number }): Uint8Array {
  // Typed arrays and no closures: the search calls this hundreds of times per analysis.
  const inside = new Uint8Array(state.length);
  for (let s = 0; s < state.length; s++) inside[s] = state[s] === OUT ? 0 : 1;
  const remaining = new Int32Array(flows.length);
  // Each reaction enters the queue at most once: when its count of reactants still in reaches 0.
  const queue = new Int32Array(flows.length);
  let queued = 0;
  for (let f = 0; f < flows.length; f++) {
    let count = 0;
    for (const s of flows[f].consumed) count += inside[s];
    remaining[f] = count;
    if (count === 0) queue[queued++] = f;
  }
  budget.left -= flows.length;
  while (queued > 0) {
    const f = queue[--queued];
    for (const s of flows[f].produced) {
      if (!inside[s]) continue;
      inside[s] = 0;
      budget.left -= consumers[s].length;
      for (const g of consumers[s]) if (--remaining[g] === 0) queue[queued++] = g;
    }
  }
  return inside;
}

/** A siphon is minimal when removing any one species leaves no siphon inside the rest. */
function isMinimalSiphon(members: number[], speciesCount: number, flows: Flow[], consumers: number[][], budget: { left: number }): boolean {
  const state = new Uint8Array(speciesCount).fill(OUT);
  for (const s of members) state[s] = FREE;
  return members.every((species) => {
    state[species] = OUT;
    const rest = largestSiphonWithin(state, flows, consumers, budget);
    state[species] = FREE;
    return rest.every((value) => value === 0);
  });
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
      conclusion: "The search for minimal siphons ran past its work limit: this network has too many to list, so the siphon criterion is undecided.",
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
