// Writes a mass-action mechanism as `.weave` text. Rates are decimals (the language has no
// fractions); where that decimal is not the exact rate, the exact fraction follows as a comment.
import * as Q from "../ode/rational";
import type { MassActionMechanism } from "./mass-action";

const PLAIN_NAME = /^[A-Za-z][A-Za-z0-9_]*$/;

function speciesText(name: string): string {
  return PLAIN_NAME.test(name) ? name : `"${name}"`;
}

export function complexText(exponents: readonly number[], species: readonly string[]): string {
  const terms = exponents.flatMap((e, i) => {
    if (e === 0) return [];
    const name = speciesText(species[i]);
    // `2e` would read as a number in exponent notation, so such names get a space.
    return [e === 1 ? name : /^[eE]/.test(name) ? `${e} ${name}` : `${e}${name}`];
  });
  return terms.length ? terms.join(" + ") : "0";
}

export function rateText(rate: Q.Rational): string {
  const decimal = String(Q.toNumber(rate));
  return Q.equals(Q.fromNumber(Number(decimal)), rate) ? decimal : `${decimal}  # ${Q.toText(rate)}`;
}

export function toWeaveText(mechanism: MassActionMechanism, heading: string): string {
  const lines = mechanism.reactions.map(
    (r) => `${complexText(r.reactant, mechanism.species)} -> ${complexText(r.product, mechanism.species)} @ ${rateText(r.rate)}`,
  );
  return [`# ${heading}`, ...lines].join("\n") + "\n";
}
