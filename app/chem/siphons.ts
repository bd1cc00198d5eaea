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

/**
 * Every minimal siphon, by a branching search: a set that is not yet a siphon has a reaction that
 * produces one of its members and consumes none; one of that reaction's reactants must join. The
 * branch taken is the open reaction with the fewest reactants still allowed (one: no branching at
 * all); a branch dies when the largest siphon avoiding the excluded species (its "room") loses an
 * included one, and supersets of siphons already found are dropped. The room is kept up to date
 * as species are excluded and restored on backtracking, and each step looks only at reactions
 * around the included species, so a branch costs what it touches rather than the whole network.
 * Exponential in the worst case (the answer itself may be). Null when the work passes
 * `workLimit` reactant visits.
 */
export function minimalSiphons(network: Network, workLimit = MAX_SIPHON_SEARCH_WORK): number[][] | null {
  return new SiphonSearch(siphonFlows(network), network.species.length, workLimit).run();
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

const FREE = 0;
const IN = 1;
const OUT = 2;

class SiphonSearch {
  private readonly consumers: number[][];
  private readonly producers: number[][];
  private readonly state: Uint8Array;
  /**
   * The room: the largest siphon among the species not OUT (the union of all siphons there).
   * Shrinking the allowed set shrinks it by propagation from the old room alone, so exclusions
   * update it in place and `trail` (the species it lost, in order) undoes them.
   */
  private readonly inRoom: Uint8Array;
  /** Per reaction, its reactants still in the room; at 0 it drops from the room what it produces. */
  private readonly reactantsInRoom: Int32Array;
  private readonly trail: number[] = [];
  private readonly found: number[][] = [];
  /** Per species, the found siphons holding it; per found siphon, its members not included now. */
  private readonly foundWith: number[][];
  private readonly notIncluded: number[] = [];
  /** Found siphons wholly included: while one is, the branch holds only supersets of it. */
  private foundIncluded = 0;
  private readonly members: number[] = [];
  private work: number;

  constructor(
    private readonly flows: Flow[],
    speciesCount: number,
    workLimit: number,
  ) {
    this.work = workLimit;
    this.consumers = Array.from({ length: speciesCount }, (): number[] => []);
    this.producers = Array.from({ length: speciesCount }, (): number[] => []);
    this.foundWith = Array.from({ length: speciesCount }, (): number[] => []);
    flows.forEach(({ consumed, produced }, f) => {
      for (const s of consumed) this.consumers[s].push(f);
      for (const s of produced) this.producers[s].push(f);
    });
    this.state = new Uint8Array(speciesCount);
    this.inRoom = new Uint8Array(speciesCount).fill(1);
    this.reactantsInRoom = new Int32Array(flows.length);
    const emptied: number[] = [];
    flows.forEach(({ consumed }, f) => {
      this.reactantsInRoom[f] = consumed.length;
      if (consumed.length === 0) emptied.push(f);
    });
    this.work -= flows.length;
    // Species in no siphon at all (those a reaction without reactants restores) leave for good.
    for (const f of emptied) this.dropProducts(f);
    this.propagate(0);
    this.trail.length = 0;
  }

  run(): number[][] | null {
    for (let s = 0; s < this.state.length; s++) {
      if (!this.inRoom[s]) continue;
      // Siphons holding s but none of the species before it: each minimal siphon is found from its first species.
      this.include(s);
      const complete = this.search();
      this.release();
      this.exclude(s);
      if (!complete) return null;
    }
    return minimalAmong(this.found).sort(compareLexicographic);
  }

  /** Branches below the present included set; false when the work limit cut the search short. */
  private search(): boolean {
    this.work--;
    if (this.work < 0) return false;
    if (this.foundIncluded > 0) return true;
    const branch = this.narrowestOpenReaction();
    if (branch === null) {
      this.record([...this.members].sort((a, b) => a - b));
      return true;
    }
    const mark = this.trail.length;
    const excluded: number[] = [];
    let complete = true;
    for (const reactant of branch) {
      this.include(reactant);
      complete = this.search();
      this.release();
      // Later branches avoid it: each siphon is found along one path only. If the room then loses
      // an included species, so does every later branch, which excludes more.
      const keepsMembers = this.exclude(reactant);
      excluded.push(reactant);
      if (!complete || !keepsMembers) break;
    }
    this.restore(mark);
    for (const s of excluded) this.state[s] = FREE;
    return complete;
  }

  /** Reactants of the open reaction with the fewest that may still join; null when the included set is a siphon. */
  private narrowestOpenReaction(): number[] | null {
    let branch: number[] | null = null;
    for (const member of this.members) {
      for (const f of this.producers[member]) {
        const { consumed } = this.flows[f];
        this.work -= consumed.length;
        if (consumed.some((s) => this.state[s] === IN)) continue;
        const allowed = consumed.filter((s) => this.state[s] === FREE && this.inRoom[s] === 1);
        if (branch === null || allowed.length < branch.length) branch = allowed;
        if (allowed.length <= 1) return branch;
      }
    }
    return branch;
  }

  private include(species: number): void {
    this.state[species] = IN;
    this.members.push(species);
    for (const k of this.foundWith[species]) if (--this.notIncluded[k] === 0) this.foundIncluded++;
  }

  /** Takes back the last included species (its state is left to the caller). */
  private release(): void {
    const species = this.members.pop()!;
    for (const k of this.foundWith[species]) if (this.notIncluded[k]++ === 0) this.foundIncluded--;
  }

  /** A siphon made of the included species, all of them included now. */
  private record(siphon: number[]): void {
    const k = this.found.push(siphon) - 1;
    for (const s of siphon) this.foundWith[s].push(k);
    this.notIncluded.push(0);
    this.foundIncluded++;
  }

  /** Marks a species OUT and shrinks the room; false when the room loses an included species. */
  private exclude(species: number): boolean {
    this.state[species] = OUT;
    if (!this.inRoom[species]) return true;
    const start = this.trail.length;
    this.dropFromRoom(species);
    return this.propagate(start);
  }

  /**
   * Lowers the reactant counts for the species dropped since `start`, dropping in turn what
   * reactions left without reactants produce. Runs to the end even past a conflict, so that
   * `restore` finds every count it must raise again. False when an included species was dropped.
   */
  private propagate(start: number): boolean {
    let keepsMembers = true;
    for (let k = start; k < this.trail.length; k++) {
      const s = this.trail[k];
      if (this.state[s] === IN) keepsMembers = false;
      this.work -= this.consumers[s].length;
      for (const g of this.consumers[s]) if (--this.reactantsInRoom[g] === 0) this.dropProducts(g);
    }
    return keepsMembers;
  }

  private dropProducts(f: number): void {
    for (const s of this.flows[f].produced) if (this.inRoom[s]) this.dropFromRoom(s);
  }

  private dropFromRoom(species: number): void {
    this.inRoom[species] = 0;
    this.trail.push(species);
  }

  private restore(mark: number): void {
    while (this.trail.length > mark) {
      const s = this.trail.pop()!;
      this.inRoom[s] = 1;
      for (const g of this.consumers[s]) this.reactantsInRoom[g]++;
    }
  }
}

/**
 * The sets among `siphons` with no other inside them. The search finds every minimal siphon, so a
 * siphon it finds that is not minimal holds a minimal one it also found: comparing with the
 * minimal ones, smallest first, is enough.
 */
function minimalAmong(siphons: number[][]): number[][] {
  const minimal: Set<number>[] = [];
  for (const siphon of [...siphons].sort((a, b) => a.length - b.length)) {
    const members = new Set(siphon);
    if (!minimal.some((smaller) => smaller.size < members.size && [...smaller].every((s) => members.has(s)))) minimal.push(members);
  }
  return minimal.map((members) => [...members]);
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
      conclusion: "Minimal siphons not enumerated: too many. The search ran past its work limit, so the siphon criterion is undecided.",
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
