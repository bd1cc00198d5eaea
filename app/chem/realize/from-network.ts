// A parsed network as an exact mass-action mechanism, so that its induced ODE can be searched for
// other realizations. Rates are read as the decimals they were written as.
import type { Network } from "../model";
import * as Q from "../linalg/rational";
import type { MassActionMechanism } from "./mass-action";

export function massActionOf(network: Network): MassActionMechanism {
  const exponents = complexesOf(network);
  return {
    species: [...network.species],
    reactions: network.reactions.map((reaction) => {
      const step = `${network.complexes[reaction.from].text} -> ${network.complexes[reaction.to].text}`;
      if (reaction.law !== null) throw new RangeError(`${step} has a custom rate law; only mass action can be realized`);
      if (reaction.rate === null) throw new RangeError(`${step} has no rate coefficient`);
      return { reactant: exponents[reaction.from], product: exponents[reaction.to], rate: Q.fromNumber(reaction.rate) };
    }),
  };
}

/** The complexes of the network as exponent vectors (extra candidates for the search). */
export function complexesOf(network: Network): number[][] {
  return network.complexes.map((complex) => {
    const vector = network.species.map(() => 0);
    for (const { species, coefficient } of complex.terms) vector[species] = coefficient;
    return vector;
  });
}
