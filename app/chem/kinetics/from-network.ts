// A reaction network under its kinetics, as a kinetic system: mass-action rates k·∏x^α over the
// reactant complex, custom laws evaluated with mathjs over species, parameters and fixed species.

import { readLaw } from "~/chem/law";
import type { Mechanism, Network, Reaction } from "~/chem/model";
import { SimulationInputError } from "./errors";
import { compileKineticSystem, type CustomRate, type KineticSpec, type KineticSystem, type MonomialRate } from "./kinetic-system";

export function networkSpec(mechanism: Mechanism, network: Network): KineticSpec {
  const missing = network.reactions.filter((reaction) => reaction.rate === null && reaction.law === null);
  if (missing.length > 0) {
    const where = missing.map((reaction) => {
      const text = `${network.complexes[reaction.from].text} -> ${network.complexes[reaction.to].text}`;
      const line = mechanism.steps[reaction.steps[0]]?.line;
      return line === undefined ? text : `${text} (line ${line})`;
    });
    throw new SimulationInputError(`cannot simulate: no rate coefficient for ${where.join("; ")}`);
  }

  const index = new Map(network.species.map((name, i) => [name, i]));
  const monomials: MonomialRate[] = [];
  const custom: CustomRate[] = [];
  const { massAction, laws } = reactionsByKind(network);
  for (const reaction of massAction) {
    monomials.push({
      coefficient: reaction.rate as number,
      factors: network.complexes[reaction.from].terms.map((t) => ({ variable: t.species, power: t.coefficient })),
    });
  }
  for (const reaction of laws) custom.push(customRate(reaction.law as string, mechanism, index));

  const changes: KineticSpec["changes"] = [];
  [...massAction, ...laws].forEach((reaction, rate) => {
    const net = new Map<number, number>();
    for (const t of network.complexes[reaction.to].terms) net.set(t.species, (net.get(t.species) ?? 0) + t.coefficient);
    for (const t of network.complexes[reaction.from].terms) net.set(t.species, (net.get(t.species) ?? 0) - t.coefficient);
    for (const [variable, change] of net) if (change !== 0) changes.push({ variable, rate, change });
  });

  return {
    names: network.species,
    initial: network.species.map((name) => mechanism.initial[name] ?? 0),
    nonNegative: true,
    monomials,
    custom,
    changes,
  };
}

/** Mass-action reactions, then custom laws: the order of the spec's rates (rate j is reaction j of `[...massAction, ...laws]`). */
export function reactionsByKind(network: Network): { massAction: Reaction[]; laws: Reaction[] } {
  return {
    massAction: network.reactions.filter((reaction) => reaction.law === null),
    laws: network.reactions.filter((reaction) => reaction.law !== null),
  };
}

export function networkSystem(mechanism: Mechanism, network: Network): KineticSystem {
  return compileKineticSystem(networkSpec(mechanism, network));
}

function customRate(law: string, mechanism: Mechanism, index: Map<string, number>): CustomRate {
  const reading = readLaw(law);
  if (!reading.ok) throw new SimulationInputError(`rate law { ${law} }: ${reading.message}`);
  const expression = reading.node.compile();
  const dependsOn = [...new Set(reading.symbols.filter((name) => index.has(name)).map((name) => index.get(name) as number))];
  const scope = new Map<string, number>([...Object.entries(mechanism.parameters), ...Object.entries(mechanism.fixed)]);
  const names = [...index.keys()];
  const evaluate = (y: Float64Array) => {
    for (const i of dependsOn) scope.set(names[i], y[i]);
    const value: unknown = expression.evaluate(scope);
    return typeof value === "number" ? value : Number.NaN;
  };
  try {
    evaluate(Float64Array.from(names, (name) => mechanism.initial[name] ?? 0));
  } catch (error) {
    throw new SimulationInputError(`rate law { ${law} }: ${(error as Error).message}`);
  }
  return { evaluate, dependsOn };
}
