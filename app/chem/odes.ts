// The induced kinetic differential equations: dx_i/dt = Σ_reactions (y'_i − y_i)·rate, with
// mass-action rates coefficient·x^y unless a step gives its own law. Written with the names the
// author used (k1, not its value).
//
// Two writings. The text is for machines (the `analyze --json` contract): one term per reaction,
// in reaction order, `*` between factors. The LaTeX is for people: concentrations in brackets,
// every literal number and stoichiometric factor multiplied into one readable number
// (2 × 1.5e9 → 3 × 10^9), like terms combined, and a break allowed between terms.
import {
  concentrationLatex,
  factorLatex,
  lawLatex,
  lawNeedsParentheses,
  massActionText,
  monomialText,
} from "./expression";
import type { Network, RateExpression, RateFactor } from "./model";
import { reactionVector } from "./network";
import { readableNumberLatex } from "./numbers";

export interface InducedOdes {
  /** Species → right-hand side as text, e.g. "-k1*X*Y + 2*k2*Y^2"; "0" when nothing changes it. */
  text: Record<string, string>;
  /**
   * Species → the whole equation in LaTeX, e.g. "\frac{d[X]}{dt} = -k_{1}\, [X][Y]", with
   * `\allowbreak` before each further term: where a long right-hand side may wrap.
   */
  latex: Record<string, string>;
}

/** Significant digits of a number the equations computed (a product or sum of literals). */
const typesetDigits = 3;

/** The separator between typeset terms; the LaTeX export breaks its rows here. */
export const termBreak = " \\allowbreak ";

interface RateWriting {
  text: string;
  /** Whether a sign or a multiplier needs parentheses around the text. */
  compound: boolean;
  /** The rate as products of a literal number and the rest in LaTeX (one per summand). */
  latexTerms: LatexTerm[];
}

/** number × rest; terms with the same rest are like terms. */
interface LatexTerm {
  number: number;
  rest: string;
  /** A custom law: parenthesised when multiplied by anything but 1. */
  compound: boolean;
}

export function inducedOdes(network: Network): InducedOdes {
  const rates = network.reactions.map((reaction): RateWriting => {
    if (reaction.law !== null) {
      const compound = lawNeedsParentheses(reaction.law);
      return { text: reaction.law, compound, latexTerms: [{ number: 1, rest: lawLatex(reaction.law), compound }] };
    }
    const from = network.complexes[reaction.from];
    const monomial = from.terms.map(({ species, coefficient }) => concentrationLatex(network.species[species], coefficient)).join("");
    return {
      text: massActionText(reaction.coefficient!, monomialText(from, network.species)),
      compound: false,
      latexTerms: reaction.coefficient!.map((product) => massActionTerm(product, monomial)),
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
    text[name] = joinText(terms[species]);
    latex[name] = `\\frac{d${concentrationLatex(name, 1)}}{dt} = ${joinLatex(terms[species])}`;
  });
  return { text, latex };
}

function massActionTerm(product: RateFactor[], monomial: string): LatexTerm {
  let number = 1;
  const named: string[] = [];
  // A fixed species is a concentration like the monomial's: the brackets sit together, [A][X].
  const held: string[] = [];
  for (const factor of product) {
    if (factor.kind === "value") number *= Number(factor.symbol) ** factor.power;
    else if (factor.kind === "expression" && factor.power === 1) {
      // An expression's leading number joins the term's number: 2 × 2e6*T^0.5 reads 4 × 10^6 T^0.5.
      const { value, rest } = leadingNumber(factor.expression!.tree);
      number *= value;
      if (rest) named.push(factorLatex({ ...factor, expression: { ...factor.expression!, tree: rest } }));
    } else if (factor.kind === "fixed") held.push(concentrationLatex(factor.symbol, factor.power));
    else named.push(factorLatex(factor));
  }
  const rest = [named.join(" "), held.join("") + monomial].filter(Boolean).join("\\, ");
  return { number, rest, compound: false };
}

/** A product's leftmost number and what is left of it: 2e6*T^0.5*exp(…) → 2e6 and T^0.5*exp(…). */
function leadingNumber(tree: RateExpression): { value: number; rest: RateExpression | null } {
  if (tree.kind === "number") return { value: tree.value, rest: null };
  if (tree.kind !== "binary" || tree.operator !== "*") return { value: 1, rest: tree };
  const { value, rest } = leadingNumber(tree.left);
  return { value, rest: rest ? { ...tree, left: rest } : tree.right };
}

function joinText(terms: { change: number; rate: RateWriting }[]): string {
  if (terms.length === 0) return "0";
  return terms
    .map(({ change, rate }, position) => {
      const sign = change < 0 ? (position === 0 ? "-" : " - ") : position === 0 ? "" : " + ";
      const magnitude = Math.abs(change);
      const wrapped = rate.compound && (magnitude !== 1 || change < 0) ? `(${rate.text})` : rate.text;
      return magnitude === 1 ? sign + wrapped : `${sign}${magnitude}*${wrapped}`;
    })
    .join("");
}

/** Like terms (the same names and concentrations) added up, in order of first appearance. */
function combine(terms: { change: number; rate: RateWriting }[]): LatexTerm[] {
  const combined = new Map<string, LatexTerm & { scale: number }>();
  for (const { change, rate } of terms) {
    for (const term of rate.latexTerms) {
      const number = change * term.number;
      const key = `${term.compound}|${term.rest}`;
      const seen = combined.get(key);
      if (seen) {
        seen.number += number;
        seen.scale = Math.max(seen.scale, Math.abs(number));
      } else combined.set(key, { ...term, number, scale: Math.abs(number) });
    }
  }
  // Terms that cancel up to rounding (0.1 + 0.2 − 0.3) are gone, not "5.55 × 10^-17".
  return [...combined.values()].filter(({ number, scale }) => Math.abs(number) > scale * 1e-12);
}

function joinLatex(terms: { change: number; rate: RateWriting }[]): string {
  const combined = combine(terms);
  if (combined.length === 0) return "0";
  return combined
    .map(({ number: coefficient, rest, compound }, position) => {
      const sign = coefficient < 0 ? (position === 0 ? "-" : `${termBreak}- `) : position === 0 ? "" : `${termBreak}+ `;
      const magnitude = Math.abs(coefficient);
      // Braced, a × 10^n is one unit: a line never breaks after its ×.
      const number = readableNumberLatex(magnitude, typesetDigits);
      const written = number.includes("\\times") ? `{${number}}` : number;
      if (!rest) return sign + written;
      const body = compound && (magnitude !== 1 || coefficient < 0) ? `\\left(${rest}\\right)` : rest;
      return magnitude === 1 ? sign + body : `${sign}${written}\\, ${body}`;
    })
    .join("");
}
