// Rates of production: for one species at one time of a simulation, each directed reaction's
// contribution ν·r to d[X]/dt, ranked by size — the usual first look at which steps matter. The
// state is interpolated linearly between the simulation's samples.

import { interpolate, type SimulatedCourses } from "~/chem/kinetics/csv";
import { SimulationInputError } from "~/chem/kinetics/errors";
import { networkSpec, reactionsByKind } from "~/chem/kinetics/from-network";
import type { Mechanism, Network } from "~/chem/model";
import type { RatesOfProduction, StepContribution } from "./types";

export function ratesOfProduction(mechanism: Mechanism, network: Network, simulation: SimulatedCourses, species: string, t: number): RatesOfProduction {
  const target = network.species.indexOf(species);
  if (target < 0) throw new SimulationInputError(`"${species}" is not a species of the mechanism`);
  const state = Float64Array.from(network.species, (name) => {
    const value = interpolate(simulation.t, simulation.series[name] ?? [], t);
    if (value === null) throw new SimulationInputError(`t = ${t} lies outside the simulated time span`);
    return value;
  });
  const spec = networkSpec(mechanism, network);
  const { massAction, laws } = reactionsByKind(network);
  const reactions = [...massAction, ...laws];
  const rates = [
    ...spec.monomials.map((m) => m.factors.reduce((product, f) => product * state[f.variable] ** f.power, m.coefficient)),
    ...spec.custom.map((law) => law.evaluate(state)),
  ];
  const contributions: StepContribution[] = spec.changes
    .filter((c) => c.variable === target)
    .map(({ rate, change }) => {
      const reaction = reactions[rate];
      return {
        reaction: `${network.complexes[reaction.from].text} -> ${network.complexes[reaction.to].text}`,
        steps: reaction.steps.map((index) => mechanism.steps[index].label ?? `line ${mechanism.steps[index].line}`),
        rate: rates[rate],
        change,
        contribution: change * rates[rate],
      };
    })
    .sort((a, b) => Math.abs(b.contribution) - Math.abs(a.contribution));
  return { species, t, total: contributions.reduce((sum, c) => sum + c.contribution, 0), contributions };
}
