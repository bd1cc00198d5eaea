// Absolute concentration robustness by the Shinar–Feinberg criterion (Science 327, 2010): a
// mass-action network of deficiency one that has a positive steady state, with two non-terminal
// complexes differing only in species S, has the same value of S at every positive steady state,
// whatever the conserved totals.
import type { Network } from "./model";

export interface AcrWitness {
  species: string;
  /** The two non-terminal complexes whose difference is a multiple of the species alone. */
  complexes: [string, string];
}

export interface Robustness {
  /** Species with absolute concentration robustness, in species order. */
  species: string[];
  witnesses: AcrWitness[];
  conclusion: string;
}

interface Facts {
  deficiency: number;
  terminalStrongLinkageClasses: number[][];
  customLawCount: number;
}

export function concentrationRobustness(network: Network, facts: Facts): Robustness {
  const none = (conclusion: string): Robustness => ({ species: [], witnesses: [], conclusion });
  if (network.reactions.length === 0) return none("There are no reactions yet, so there is nothing to conclude.");
  if (facts.customLawCount > 0) return none("The Shinar–Feinberg criterion is stated for mass-action kinetics; some reactions use a custom rate law, so it draws no conclusion.");
  if (facts.deficiency !== 1) {
    return none(`The Shinar–Feinberg criterion needs deficiency 1; this network has deficiency ${facts.deficiency}, so it draws no conclusion about robust concentrations.`);
  }
  const terminal = new Set(facts.terminalStrongLinkageClasses.flat());
  const nonTerminal = network.complexes.map((_, index) => index).filter((index) => !terminal.has(index));
  const witnesses = new Map<number, AcrWitness>();
  for (const [position, a] of nonTerminal.entries()) {
    for (const b of nonTerminal.slice(position + 1)) {
      const species = onlyDifference(network, a, b);
      if (species !== null && !witnesses.has(species)) {
        witnesses.set(species, { species: network.species[species], complexes: [network.complexes[a].text, network.complexes[b].text] });
      }
    }
  }
  const found = [...witnesses.keys()].sort((x, y) => x - y).map((species) => witnesses.get(species)!);
  if (found.length === 0) {
    return none("Deficiency 1, but no two non-terminal complexes differ in one species only, so the Shinar–Feinberg criterion draws no conclusion.");
  }
  const pairs = found.map(({ species, complexes }) => `${species} (${complexes[0]} and ${complexes[1]})`).join("; ");
  return {
    species: found.map((witness) => witness.species),
    witnesses: found,
    conclusion: `Deficiency 1, and non-terminal complexes differ only in one species: ${pairs}. By the Shinar–Feinberg theorem, for any rate coefficients for which a steady state with every concentration positive exists, ${found.length === 1 ? "this species takes" : "each of these species takes"} the same value at every such steady state, whatever the conserved totals (absolute concentration robustness).`,
  };
}

/** The one species in which complexes a and b differ, or null when they differ in none or in several. */
function onlyDifference(network: Network, a: number, b: number): number | null {
  const difference = new Map<number, number>();
  for (const { species, coefficient } of network.complexes[a].terms) difference.set(species, coefficient);
  for (const { species, coefficient } of network.complexes[b].terms) difference.set(species, (difference.get(species) ?? 0) - coefficient);
  const differing = [...difference].filter(([, value]) => value !== 0);
  return differing.length === 1 ? differing[0][0] : null;
}
