// A mass-action mechanism as `.weave` text, through the language's one printer. The language has
// decimal rates only, so each rate is its nearest double (8/3 → 2.6666666666666665).
import type { Mechanism, Term } from "../model";
import { printMechanism } from "../print";
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";
import type { MassActionMechanism } from "./mass-action";

const terms = (exponents: readonly number[], species: readonly string[]): Term[] =>
  exponents.flatMap((coefficient, i) => (coefficient === 0 ? [] : [{ coefficient, species: species[i] }]));

/** Initial concentrations are kept where positive: a mechanism has no negative concentrations. */
export function toMechanism(mechanism: MassActionMechanism, initial: readonly Rational[] = []): Mechanism {
  return {
    steps: mechanism.reactions.map((r) => ({
      label: null,
      reactants: terms(r.reactant, mechanism.species),
      products: terms(r.product, mechanism.species),
      reversible: false,
      forward: { kind: "value", value: Q.toNumber(r.rate) },
      backward: null,
      law: null,
      line: 0,
      from: 0,
      to: 0,
    })),
    species: [...mechanism.species],
    fixed: {},
    parameters: {},
    initial: Object.fromEntries(
      initial.flatMap((value, i) => (Q.sign(value) > 0 ? [[mechanism.species[i], Q.toNumber(value)]] : [])),
    ),
  };
}

export function mechanismText(mechanism: MassActionMechanism, heading: string, initial: readonly Rational[] = []): string {
  return `${heading.replace(/^/gm, "# ")}\n${printMechanism(toMechanism(mechanism, initial))}`;
}
