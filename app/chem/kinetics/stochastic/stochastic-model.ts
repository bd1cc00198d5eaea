// A mass-action network as a jump process on copy numbers. The convention: "volume" is the system
// size Ω, so a concentration c is n = round(c·Ω) copies (no Avogadro factor: the mechanism's
// concentrations carry whatever unit the author chose, and Ω is copies per that unit). A reaction
// with rate coefficient k and reactant complex Σ αᵢXᵢ fires with propensity
//   a(n) = k · Ω · ∏ᵢ nᵢ(nᵢ−1)…(nᵢ−αᵢ+1) / Ω^αᵢ,
// so for large Ω, a/Ω tends to the mass-action rate k·∏cᵢ^αᵢ our ODEs use (Kurtz's limit;
// Gillespie, J. Phys. Chem. 81 (1977) 2340, eq. 10 with k·Ω^(1−order) as the stochastic constant:
// the ½ for two like molecules is already inside k, as in the ODE's rate law).

import type { Mechanism, Network } from "~/chem/model";
import { MAX_COPY_NUMBER } from "~/chem/limits";
import { SimulationInputError } from "../errors";

export interface StochasticReaction {
  /** k·Ω^(1−order): the propensity is this times the falling factorials of the reactants. */
  constant: number;
  /** Reactant species and their stoichiometric coefficients (whole numbers). */
  reactants: { species: number; order: number }[];
  /** Net change of each species the reaction changes. */
  changes: { species: number; change: number }[];
}

export interface StochasticModel {
  names: string[];
  /** Copy numbers at t = 0. */
  initial: Float64Array;
  reactions: StochasticReaction[];
  /** For each reaction, the reactions whose propensity changes when it fires (itself included). */
  dependents: Int32Array[];
}

export function stochasticModel(mechanism: Mechanism, network: Network, volume: number): StochasticModel {
  if (!(volume > 0) || !Number.isFinite(volume)) throw new SimulationInputError("the volume must be a positive number");
  const reactions = network.reactions.map((reaction) => {
    const line = mechanism.steps[reaction.steps[0]]?.line;
    const where = `${network.complexes[reaction.from].text} -> ${network.complexes[reaction.to].text}${line === undefined ? "" : ` (line ${line})`}`;
    if (reaction.law !== null) throw new SimulationInputError(`stochastic runs take mass-action steps only; ${where} has a rate law`);
    if (reaction.rate === null) throw new SimulationInputError(`cannot simulate: no rate coefficient for ${where}`);
    const net = new Map<number, number>();
    for (const t of network.complexes[reaction.to].terms) net.set(t.species, (net.get(t.species) ?? 0) + t.coefficient);
    for (const t of network.complexes[reaction.from].terms) net.set(t.species, (net.get(t.species) ?? 0) - t.coefficient);
    const reactants = network.complexes[reaction.from].terms.map((t) => ({ species: t.species, order: t.coefficient }));
    if ([...net.values(), ...reactants.map((r) => r.order)].some((n) => !Number.isInteger(n))) {
      throw new SimulationInputError(`stochastic runs need whole stoichiometric coefficients; ${where} has a fraction`);
    }
    const order = reactants.reduce((sum, r) => sum + r.order, 0);
    return {
      constant: reaction.rate * volume ** (1 - order),
      reactants,
      changes: [...net].filter(([, change]) => change !== 0).map(([species, change]) => ({ species, change })),
    };
  });
  const initial = Float64Array.from(network.species, (name) => Math.round((mechanism.initial[name] ?? 0) * volume));
  const largest = network.species[initial.findIndex((n) => n > MAX_COPY_NUMBER)];
  if (largest !== undefined) {
    throw new SimulationInputError(`[${largest}] starts at more than ${MAX_COPY_NUMBER.toExponential(0)} copies at this volume; an exact method fires every event, so use a smaller volume or the deterministic run`);
  }
  return { names: network.species, initial, reactions, dependents: dependencyGraph(reactions, network.species.length) };
}

/** Gibson & Bruck's dependency graph: reaction j's propensity depends on what i changes. */
function dependencyGraph(reactions: StochasticReaction[], speciesCount: number): Int32Array[] {
  const readers: number[][] = Array.from({ length: speciesCount }, () => []);
  reactions.forEach((reaction, j) => reaction.reactants.forEach((r) => readers[r.species].push(j)));
  return reactions.map((reaction, i) => {
    const affected = new Set<number>([i]);
    for (const { species } of reaction.changes) for (const j of readers[species]) affected.add(j);
    return Int32Array.from([...affected].sort((a, b) => a - b));
  });
}

/** The propensity of `reaction` at copy numbers `counts`. */
export function propensity(reaction: StochasticReaction, counts: Float64Array): number {
  let a = reaction.constant;
  for (const { species, order } of reaction.reactants) {
    const n = counts[species];
    for (let m = 0; m < order; m++) a *= n - m;
  }
  return a > 0 ? a : 0;
}

/** Applies one firing of `reaction` to `counts`. */
export function fire(reaction: StochasticReaction, counts: Float64Array): void {
  for (const { species, change } of reaction.changes) counts[species] += change;
}
