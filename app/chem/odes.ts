// The induced kinetic differential equations: dx_i/dt = Σ_reactions (y'_i − y_i)·rate, with
// mass-action rates coefficient·x^y unless a step gives its own law. Written with the names the
// author used (k1, not its value), one term per reaction, in reaction order.
import {
  lawLatex,
  lawNeedsParentheses,
  massActionLatex,
  massActionText,
  monomialLatex,
  monomialText,
  symbolLatex,
} from "./expression";
import type { Network } from "./model";
import { reactionVector } from "./network";

export interface InducedOdes {
  /** Species → right-hand side as text, e.g. "-k1*X*Y + 2*k2*Y^2"; "0" when nothing changes it. */
  text: Record<string, string>;
  /** Species → the whole equation in LaTeX, e.g. "\frac{dX}{dt} = -k_{1} X Y". */
  latex: Record<string, string>;
}

interface RateWriting {
  text: string;
  latex: string;
  /** Whether a sign or a multiplier needs parentheses around it. */
  compound: boolean;
}

export function inducedOdes(network: Network): InducedOdes {
  const rates = network.reactions.map((reaction): RateWriting => {
    if (reaction.law !== null) {
      const compound = lawNeedsParentheses(reaction.law);
      return { text: reaction.law, latex: lawLatex(reaction.law), compound };
    }
    const from = network.complexes[reaction.from];
    return {
      text: massActionText(reaction.coefficient!, monomialText(from, network.species)),
      latex: massActionLatex(reaction.coefficient!, monomialLatex(from, network.species)),
      compound: false,
    };
  });

  const terms = network.species.map(() => [] as { change: number; rate: RateWriting }[]);
  network.reactions.forEach((reaction, index) => {
    const { indices, values } = reactionVector(network, reaction);
    indices.forEach((species, k) => terms[species].push({ change: values[k], rate: rates[index] }));
  });

  const text: Record<string, string> = {};
  const latex: Record<string, string> = {};
  network.species.forEach((name, species) => {
    text[name] = joinTerms(terms[species], "text");
    latex[name] = `\\frac{d${symbolLatex(name)}}{dt} = ${joinTerms(terms[species], "latex")}`;
  });
  return { text, latex };
}

function joinTerms(terms: { change: number; rate: RateWriting }[], notation: "text" | "latex"): string {
  if (terms.length === 0) return "0";
  return terms
    .map(({ change, rate }, position) => {
      const sign = change < 0 ? (position === 0 ? "-" : " - ") : position === 0 ? "" : " + ";
      const magnitude = Math.abs(change);
      const body = rate[notation];
      const wrapped = rate.compound && (magnitude !== 1 || change < 0) ? parenthesise(body, notation) : body;
      if (magnitude === 1) return sign + wrapped;
      return sign + (notation === "text" ? `${magnitude}*${wrapped}` : `${magnitude}\\, ${wrapped}`);
    })
    .join("");
}

function parenthesise(body: string, notation: "text" | "latex"): string {
  return notation === "text" ? `(${body})` : `\\left(${body}\\right)`;
}
