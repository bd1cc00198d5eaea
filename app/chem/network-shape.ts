// What a report draws from the network's shape alone (its species, complexes and which complex
// reacts to which, mass action or not), never from rate coefficients, initial values or labels:
// linkage, rank, deficiency, conservation laws, the theorems' verdicts, siphons, robustness and
// multistationarity without a witness search. At 500 steps this is half an analysis, while most
// keystrokes (a coefficient, a comment, a label) leave the shape alone; a room's analyses keep the
// last few shapes in a `ShapeMemo`.
import { concentrationRobustness, type Robustness } from "./acr";
import { hasPositiveConservationLaw } from "./conservation";
import { nullSpace, rank } from "./linalg/kernel";
import type { SparseVector } from "./linalg/sparse";
import { analyzeLinkage, type Linkage } from "./linkage";
import type { Network } from "./model";
import { reactionVector } from "./network";
import { multistationarity, type Multistationarity, type WitnessSearch } from "./multistationarity";
import { persistence, type Persistence } from "./siphons";
import { deficiencyOneTheorem, deficiencyZeroTheorem, type TheoremVerdict } from "./theorems";

export interface NetworkShape {
  linkage: Linkage;
  conservationLaws: number[][];
  stoichiometricRank: number;
  deficiency: number;
  linkageClassDeficiencies: number[];
  reversible: boolean;
  weaklyReversible: boolean;
  theorems: { deficiencyZero: TheoremVerdict; deficiencyOne: TheoremVerdict };
  massConserving: boolean;
  siphonVerdict: Persistence;
  robustness: Robustness;
  /** A witness search reads the coefficients: with one, the shape is not the network's alone. */
  multistationarity: Multistationarity;
}

/** `search` runs the multistationarity witness search too (see `multistationarity`); a memo's shapes have none. */
export async function networkShape(network: Network, search: WitnessSearch = { ms: 0 }): Promise<NetworkShape> {
  const { species, complexes, reactions } = network;
  const linkage = analyzeLinkage(complexes.length, reactions);

  const forest = spanningForestVectors(network, linkage.linkageClassOf);
  const conservationLaws = nullSpace(forest.map(({ vector }) => vector), species.length);
  const stoichiometricRank = species.length - conservationLaws.length;
  const vectorsByClass = linkage.linkageClasses.map((): SparseVector[] => []);
  for (const { vector, linkageClass } of forest) vectorsByClass[linkageClass].push(vector);
  // A class holding every forest vector has the network's rank: no second elimination for it.
  const classRank = (vectors: SparseVector[]) => (vectors.length === forest.length ? stoichiometricRank : rank(vectors));
  const linkageClassDeficiencies = linkage.linkageClasses.map((members, index) => members.length - 1 - classRank(vectorsByClass[index]));
  const deficiency = complexes.length - linkage.linkageClasses.length - stoichiometricRank;

  const reactionKeys = new Set(reactions.map(({ from, to }) => `${from}>${to}`));
  const reversible = reactions.length > 0 && reactions.every(({ from, to }) => reactionKeys.has(`${to}>${from}`));
  const weaklyReversible = reactions.length > 0 && linkage.strongLinkageClasses.length === linkage.linkageClasses.length;

  const terminalClassesPerLinkageClass = linkage.linkageClasses.map(() => 0);
  for (const members of linkage.terminalStrongLinkageClasses) terminalClassesPerLinkageClass[linkage.linkageClassOf[members[0]]]++;
  const customLawCount = reactions.filter((reaction) => reaction.law !== null).length;
  const facts = {
    reactionCount: reactions.length,
    deficiency,
    linkageClassDeficiencies,
    terminalClassesPerLinkageClass,
    weaklyReversible,
    customLawCount,
  };
  const theorems = { deficiencyZero: deficiencyZeroTheorem(facts), deficiencyOne: deficiencyOneTheorem(facts) };
  return {
    linkage,
    conservationLaws,
    stoichiometricRank,
    deficiency,
    linkageClassDeficiencies,
    reversible,
    weaklyReversible,
    theorems,
    massConserving: await hasPositiveConservationLaw(conservationLaws, species.length),
    siphonVerdict: await persistence(network, conservationLaws),
    robustness: concentrationRobustness(network, { deficiency, terminalStrongLinkageClasses: linkage.terminalStrongLinkageClasses, customLawCount }),
    multistationarity: await multistationarity(network, { theorems, weaklyReversible, conservationLaws }, search),
  };
}

/** Equal for two networks of the same shape: everything `networkShape` reads, and nothing else. */
export function shapeKey({ species, complexes, reactions }: Network): string {
  return JSON.stringify([species, complexes.map((complex) => complex.text), reactions.map(({ from, to, law }) => [from, to, law === null ? 0 : 1])]);
}

/** The shapes of the last few networks analysed, most recent last. */
export class ShapeMemo {
  private readonly recent = new Map<string, Promise<NetworkShape>>();

  constructor(private readonly size = 4) {}

  get(network: Network): Promise<NetworkShape> {
    const key = shapeKey(network);
    const known = this.recent.get(key);
    this.recent.delete(key);
    const shape = known ?? networkShape(network);
    this.recent.set(key, shape);
    if (this.recent.size > this.size) this.recent.delete(this.recent.keys().next().value!);
    // A failed computation is not remembered.
    shape.catch(() => this.recent.get(key) === shape && this.recent.delete(key));
    return shape;
  }
}

/**
 * Reaction vectors of a spanning forest of the complex graph. Within a linkage class every
 * reaction vector is a sum of tree vectors along a path, so these n − l vectors span the
 * stoichiometric subspace and elimination never sees the (often many more) redundant reactions.
 */
function spanningForestVectors(network: Network, linkageClassOf: number[]): { vector: SparseVector; linkageClass: number }[] {
  const parent = network.complexes.map((_, index) => index);
  const find = (node: number): number => {
    while (parent[node] !== node) node = parent[node] = parent[parent[node]];
    return node;
  };
  const forest: { vector: SparseVector; linkageClass: number }[] = [];
  for (const { from, to } of network.reactions) {
    const a = find(from);
    const b = find(to);
    if (a === b) continue;
    parent[a] = b;
    forest.push({ vector: reactionVector(network, { from, to }), linkageClass: linkageClassOf[from] });
  }
  return forest;
}
