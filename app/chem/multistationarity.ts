// Can one compatibility class hold several positive steady states? In this order: a deficiency
// theorem that rules it out; no positive flux through the network at all (then no positive steady
// state exists); the injectivity determinant with terms of one sign (see injectivity.ts). When the
// determinant changes sign, a witness is searched for: a positive state x* and coefficients making
// it a steady state (κ_r = v_r / x*^y_r for a positive flux v with N v = 0) at which the
// determinant has the sign opposite to (−1)^rank. The Brouwer degree of the class is (−1)^rank for
// networks without boundary steady states (Conradi, Feliu, Mincheva and Wiuf 2017), so such a
// class holds further steady states; Newton's method with deflation finds them, and each is kept
// only if its residual verifies.
import { det } from "mathjs";
import { loadSolver } from "./conservation";
import { determinantMatrix, determinantSigns } from "./injectivity";
import { networkEquilibrium } from "./kinetics/equilibrium";
import { MAX_WITNESS_SAMPLES } from "./limits";
import type { Mechanism, Network, Step } from "./model";
import { buildNetwork, reactionVector } from "./network";
import { seededRandom } from "./seeded-random";
import type { TheoremVerdict } from "./theorems";

export interface MultistationarityWitness {
  /** One rate coefficient per reaction, in the order of the report's `reactions`. */
  rates: number[];
  /** Two or more distinct positive steady states with the same conserved totals. */
  equilibria: Record<string, number>[];
}

export interface Multistationarity {
  verdict: "excluded" | "possible" | "undecided";
  reason: string;
  witness?: MultistationarityWitness;
}

interface Facts {
  theorems: { deficiencyZero: TheoremVerdict; deficiencyOne: TheoremVerdict };
  weaklyReversible: boolean;
  conservationLaws: number[][];
}

/** How long the witness search may run and how many sample points it tries; `onProgress` hears the share of the time spent. */
export interface WitnessSearch {
  ms: number;
  samples?: number;
  onProgress?: (fraction: number) => void;
}

/**
 * `search.ms` bounds the witness search (0: none). It costs seconds on networks whose determinant
 * changes sign, so rooms, which recompute on every change, leave it to a queued job (witness-job.ts)
 * and the command line.
 */
export async function multistationarity(network: Network, facts: Facts, search: WitnessSearch = { ms: 0 }): Promise<Multistationarity> {
  if (network.reactions.length === 0) return { verdict: "undecided", reason: "There are no reactions yet, so there is nothing to conclude." };
  if (network.reactions.some((reaction) => reaction.law !== null)) {
    return { verdict: "undecided", reason: "Some reactions use a custom rate law; these criteria are stated for mass-action kinetics, so none is decided." };
  }
  const { deficiencyZero, deficiencyOne } = facts.theorems;
  if (deficiencyZero.applies) {
    return {
      verdict: "excluded",
      reason: facts.weaklyReversible
        ? "Deficiency Zero Theorem (deficiency 0, weakly reversible): every compatibility class has exactly one positive steady state, whatever the rate coefficients."
        : "Deficiency Zero Theorem (deficiency 0, not weakly reversible): there is no positive steady state at all, whatever the rate coefficients.",
    };
  }
  if (deficiencyOne.applies) {
    return {
      verdict: "excluded",
      reason: "Deficiency One Theorem (each linkage class of deficiency at most 1, the deficiencies adding up, one terminal class per linkage class): no compatibility class holds more than one positive steady state, whatever the rate coefficients.",
    };
  }
  if (!(await hasPositiveFlux(network, facts.weaklyReversible))) {
    return {
      verdict: "excluded",
      reason: "No positive combination of the reactions leaves every concentration unchanged, so no choice of rate coefficients gives a steady state with every concentration positive.",
    };
  }

  const laws = facts.conservationLaws;
  let signs;
  try {
    signs = determinantSigns(network, laws);
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    return { verdict: "undecided", reason: "Undecided: the determinant's integer coefficients grow past exact arithmetic." };
  }
  const criterion = laws.length === 0 ? "Craciun–Feinberg injectivity criterion" : "injectivity criterion with conservation laws (Wiuf–Feliu)";
  if (signs.kind === "too-large") {
    return {
      verdict: "undecided",
      reason: `Undecided: too large. The ${criterion} would examine ${signs.terms.toLocaleString("en")} candidate terms of the Jacobian's determinant, beyond the limit, and no deficiency theorem applies.`,
    };
  }
  const { positive, negative, expectedSign } = signs;
  if (positive + negative === 0) {
    return { verdict: "undecided", reason: `Undecided: the determinant of the ${criterion} is identically 0, so it says nothing, and no deficiency theorem applies.` };
  }
  if (positive === 0 || negative === 0) {
    return {
      verdict: "excluded",
      reason: `${capitalized(criterion)}: the Jacobian's determinant, with the conservation laws in place of dependent rows, has ${positive + negative} terms in the rate coefficients and concentrations, all of one sign. The species formation rate is injective on every compatibility class, so no class holds two positive steady states, whatever the rate coefficients.`,
    };
  }
  const both = `The ${criterion} does not rule it out: the Jacobian's determinant has ${positive} positive and ${negative} negative terms.`;
  const unproven = `${both} For a network without steady states on the boundary of a positive class this means some rate coefficients give several steady states in one class (Conradi, Feliu, Mincheva and Wiuf 2017);`;
  if (search.ms <= 0) {
    return { verdict: "possible", reason: `${unproven} a witness search takes longer than this analysis: run it as a job, or with mechweave analyze FILE.` };
  }
  const samples = search.samples ?? MAX_WITNESS_SAMPLES;
  const witness = searchWitness(network, laws, expectedSign, await fluxSampler(network), { ...search, samples });
  if (witness) {
    return {
      verdict: "possible",
      reason: `${both} A witness shows it: with the rate coefficients listed, ${witness.equilibria.length} distinct positive steady states share every conserved total (each checked by its residual).`,
      witness,
    };
  }
  return {
    verdict: "possible",
    reason: `${unproven} no witness was found within the search's budget (${samples} sample points, ${search.ms / 1000} s).`,
  };
}

/**
 * Whether some flux v with every reaction running (v > 0) leaves every concentration unchanged
 * (N v = 0). Two cases need no LP: a weakly reversible network has one (every reaction lies on a
 * cycle of the complex graph, and the sum of those cycles balances every complex, hence every
 * species), and a species that the reactions only make, or only use, rules one out.
 */
export async function hasPositiveFlux(network: Network, weaklyReversible: boolean): Promise<boolean> {
  if (weaklyReversible) return true;
  if (hasOneWaySpecies(network)) return false;
  const ones = network.reactions.map(() => 1);
  return (await fluxSolver(network))(ones, ones) !== null;
}

/** A species whose net change has one sign in every reaction that changes it. */
function hasOneWaySpecies(network: Network): boolean {
  const made = new Uint8Array(network.species.length);
  const used = new Uint8Array(network.species.length);
  for (const reaction of network.reactions) {
    const { indices, values } = reactionVector(network, reaction);
    indices.forEach((s, k) => (values[k] > 0 ? (made[s] = 1) : values[k] < 0 && (used[s] = 1)));
  }
  return network.species.some((_, s) => made[s] !== used[s]);
}

/** Positive fluxes v with N v = 0 for the witness search: random vertices of a bounded slice of the flux cone. */
async function fluxSampler(network: Network): Promise<(random: () => number) => number[] | null> {
  const solve = await fluxSolver(network);
  return (random) => solve(network.reactions.map(() => 10 ** (4 * random() - 2)), network.reactions.map(() => random()));
}

/** The LP min Σ weight·v subject to N v = 0 and v ≥ lower; its optimal v, or null when infeasible. */
export async function fluxSolver(network: Network): Promise<(lower: number[], weights: number[]) => number[] | null> {
  const solver = await loadSolver();
  const species = network.species.length;
  const rows: string[][] = Array.from({ length: species }, () => []);
  network.reactions.forEach((reaction, r) => {
    const { indices, values } = reactionVector(network, reaction);
    indices.forEach((s, k) => rows[s].push(`${values[k] < 0 ? "-" : "+"} ${Math.abs(values[k])} v${r}`));
  });
  const constraints = rows.flatMap((terms, s) => (terms.length === 0 ? [] : [` s${s}: ${terms.join(" ")} = 0`]));
  return (lower, weights) => {
    const objective = weights.map((weight, r) => `+ ${weight} v${r}`).join(" ");
    const bounds = lower.map((bound, r) => ` v${r} >= ${bound}`);
    const problem = ["Minimize", ` obj: ${objective}`, "Subject To", ...constraints, "Bounds", ...bounds, "End"].join("\n");
    const result = solver.solve(problem, { output_flag: false });
    if (result.Status !== "Optimal") return null;
    return network.reactions.map((_, r) => (result.Columns[`v${r}`] as { Primal: number }).Primal);
  };
}

function searchWitness(
  network: Network,
  laws: number[][],
  expectedSign: number,
  flux: (random: () => number) => number[] | null,
  { ms, samples, onProgress }: Required<Omit<WitnessSearch, "onProgress">> & Pick<WitnessSearch, "onProgress">,
): MultistationarityWitness | null {
  const random = seededRandom(0x18);
  const start = performance.now();
  const deadline = start + ms;
  for (let sample = 0; sample < samples && performance.now() < deadline; sample++) {
    onProgress?.(Math.max(sample / samples, (performance.now() - start) / ms));
    const v = flux(random);
    if (!v) continue;
    const x = network.species.map(() => 10 ** (4 * random() - 2));
    const rates = v.map((flux, r) => flux / reactantMonomial(network, r, x));
    const value = det(determinantMatrix(network, laws, rates, x)) as number;
    if (value === 0 || Math.sign(value) === expectedSign) continue;
    const equilibria = classEquilibria(network, rates, x, laws, random, deadline);
    if (equilibria.length >= 2) {
      return { rates, equilibria: equilibria.map((state) => Object.fromEntries(network.species.map((name, s) => [name, state[s]]))) };
    }
  }
  return null;
}

/**
 * The verified, distinct positive steady states found in the class of x* at these rates. x* has
 * the "wrong" sign, so it is not a stable node: trajectories from just beside it, on either side
 * along a random direction of the stoichiometric subspace, run off to other steady states, which
 * Newton's method then refines.
 */
function classEquilibria(network: Network, rates: number[], x: number[], laws: number[][], random: () => number, deadline: number): number[][] {
  const direction = new Array<number>(x.length).fill(0);
  network.reactions.forEach((reaction) => {
    const { indices, values } = reactionVector(network, reaction);
    const weight = random() - 0.5;
    indices.forEach((s, k) => (direction[s] += weight * values[k]));
  });
  const step = 1e-3 / Math.max(...direction.map((value, s) => Math.abs(value) / x[s]), Number.MIN_VALUE);
  const found: number[][] = [x];
  for (const side of [1, -1]) {
    if (performance.now() > deadline) break;
    const beside = x.map((value, s) => value + side * step * direction[s]);
    const mechanism = witnessMechanism(network, rates, beside);
    const settleTime = 1e3 * Math.max(...x) / Math.min(...rates.map((rate, r) => rate * reactantMonomial(network, r, x)));
    const result = networkEquilibrium(mechanism, buildNetwork(mechanism), { settleTime, randomStarts: 1 });
    found.push(...result.equilibria.filter((equilibrium) => equilibrium.positive).map((equilibrium) => network.species.map((name) => equilibrium.state[name])));
  }
  const verified = found.filter((state) => isSteadyStateInClass(network, rates, state, laws, x));
  return verified.filter((state, i) => verified.slice(0, i).every((other) => !sameState(state, other)));
}

function reactantMonomial(network: Network, reaction: number, x: number[]): number {
  return network.complexes[network.reactions[reaction].from].terms.reduce((product, { species, coefficient }) => product * x[species] ** coefficient, 1);
}

/** The largest |f_X(x)| relative to the largest reaction rate at x: 0 at a steady state. */
export function relativeResidual(network: Network, rates: number[], state: number[]): number {
  const f = new Array<number>(state.length).fill(0);
  let largest = 0;
  network.reactions.forEach((reaction, r) => {
    const rate = network.complexes[reaction.from].terms.reduce((product, { species, coefficient }) => product * state[species] ** coefficient, rates[r]);
    largest = Math.max(largest, rate);
    const { indices, values } = reactionVector(network, reaction);
    indices.forEach((s, k) => (f[s] += values[k] * rate));
  });
  return Math.max(0, ...f.map(Math.abs)) / largest;
}

/** f(x) vanishes to 1e-8 of the largest reaction rate, and every conserved total matches x*'s. */
export function isSteadyStateInClass(network: Network, rates: number[], state: number[], laws: number[][], reference: number[]): boolean {
  if (!state.every((value) => Number.isFinite(value) && value > 0)) return false;
  if (!(relativeResidual(network, rates, state) <= 1e-8)) return false;
  return laws.every((law) => {
    const total = law.reduce((sum, weight, s) => sum + weight * reference[s], 0);
    const here = law.reduce((sum, weight, s) => sum + weight * state[s], 0);
    const size = law.reduce((sum, weight, s) => sum + Math.abs(weight * reference[s]), 0);
    return Math.abs(here - total) <= 1e-8 * size;
  });
}

function sameState(a: number[], b: number[]): boolean {
  return a.every((value, s) => Math.abs(value - b[s]) <= 1e-6 * Math.max(Math.abs(value), Math.abs(b[s])));
}

/** The network as a mechanism of irreversible steps with the given coefficients, starting at `initial`. */
function witnessMechanism(network: Network, rates: number[], initial: number[]): Mechanism {
  const terms = (complex: number) => network.complexes[complex].terms.map(({ species, coefficient }) => ({ species: network.species[species], coefficient }));
  const steps = network.reactions.map(
    ({ from, to }, r): Step => ({
      label: null, reactants: terms(from), products: terms(to), reversible: false, forward: { kind: "value", value: rates[r] },
      backward: null, law: null, line: r + 1, from: 0, to: 0,
    }),
  );
  return { steps, species: network.species, fixed: {}, parameters: {}, initial: Object.fromEntries(network.species.map((name, s) => [name, initial[s]])) };
}

function capitalized(text: string): string {
  return text[0].toUpperCase() + text.slice(1);
}
