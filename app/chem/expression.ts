// How rate expressions are written out, as plain text and as LaTeX: one place, so that the ODEs,
// the detailed-balance conditions and merged custom laws always agree on notation.
import type { MathNode } from "mathjs";
import { readLaw } from "./law";
import type { ComplexVector, RateExpression, RateFactor } from "./model";
import { readableNumberLatex } from "./numbers";
import { speciesToken } from "./print";
import { operandNeedsParentheses, rateExpressionPrecedence } from "./rate-expression";

// ---- plain text (the `.weave` spelling of names, mathjs operators)

/** An expression coefficient is grouped, so that it stays one factor beside others and under powers. */
function groupedExpression(factor: RateFactor): boolean {
  return factor.kind === "expression" && factor.expression!.tree.kind !== "call";
}

function factorText(factor: RateFactor): string {
  const base = factor.kind === "fixed" ? speciesToken(factor.symbol) : groupedExpression(factor) ? `(${factor.symbol})` : factor.symbol;
  return factor.power === 1 ? base : `${base}^${factor.power}`;
}

/** A coefficient as a sum of products, e.g. "k1*A^2" or "k1 + k2". */
export function coefficientText(sum: RateFactor[][]): string {
  return sum.map((product) => withoutUnitFactors(product).map(factorText).join("*")).join(" + ");
}

/** A literal 1 says nothing beside other factors (`@ 1` with fixed A reads "A", not "1*A"). */
function withoutUnitFactors(product: RateFactor[]): RateFactor[] {
  const kept = product.filter((factor) => !(factor.kind === "value" && Number(factor.symbol) === 1));
  return kept.length > 0 ? kept : product.slice(0, 1);
}

function isUnit(sum: RateFactor[][]): boolean {
  return sum.length === 1 && sum[0].every((factor) => factor.kind === "value" && Number(factor.symbol) === 1);
}

/** The mass-action monomial of a complex, e.g. "X*Y^2"; "" for the zero complex. */
export function monomialText(complex: ComplexVector, species: string[]): string {
  return complex.terms
    .map(({ species: index, coefficient }) => speciesToken(species[index]) + (coefficient === 1 ? "" : `^${coefficient}`))
    .join("*");
}

/** Coefficient times monomial, parenthesising a merged sum: "(k1 + k2)*X". */
export function massActionText(sum: RateFactor[][], monomial: string): string {
  if (monomial && isUnit(sum)) return monomial;
  const coefficient = sum.length > 1 ? `(${coefficientText(sum)})` : coefficientText(sum);
  return monomial ? `${coefficient}*${monomial}` : coefficient;
}

/** Whether a law must be parenthesised when multiplied or negated. */
export function lawNeedsParentheses(law: string): boolean {
  const reading = readLaw(law);
  if (!reading.ok) return true;
  const node = reading.node as MathNode & { op?: string; args?: MathNode[] };
  return node.type === "OperatorNode" && (node.op === "+" || node.op === "-");
}

// ---- LaTeX

const greek = new Set([
  "alpha", "beta", "gamma", "delta", "epsilon", "zeta", "eta", "theta", "kappa", "lambda", "mu", "nu",
  "xi", "rho", "sigma", "tau", "phi", "chi", "psi", "omega", "Gamma", "Delta", "Theta", "Lambda", "Phi", "Omega",
]);

/** Special characters made safe inside math mode (\^ and \~ alone are text-mode accents, errors here). */
const mathEscapes: Record<string, string> = { "\\": "\\backslash ", "^": "\\text{\\^{}}", "~": "\\text{\\~{}}" };

function escapeLatex(text: string): string {
  return text.replace(/[\\{}$&#^_%~]/g, (char) => mathEscapes[char] ?? `\\${char}`);
}

function latexBase(base: string): string {
  if (greek.has(base)) return `\\${base}`;
  return base.length === 1 ? base : `\\mathrm{${escapeLatex(base)}}`;
}

/** k1 → k_{1}, k_f → k_{f}, ATP → \mathrm{ATP}, alpha → \alpha; quoted names upright as written. */
export function symbolLatex(name: string): string {
  if (!/^[A-Za-z][A-Za-z0-9_]*$/.test(name)) return `\\mathrm{${escapeLatex(name)}}`;
  const underscore = name.indexOf("_");
  if (underscore > 0 && underscore < name.length - 1) {
    return `${latexBase(name.slice(0, underscore))}_{${latexBase(name.slice(underscore + 1))}}`;
  }
  const digits = /^([A-Za-z]+)(\d+)$/.exec(name);
  if (digits) return `${latexBase(digits[1])}_{${digits[2]}}`;
  return latexBase(name);
}

/** A literal number with every digit it has, as a × 10^n outside 10^-3..10^5. */
export function numberLatex(text: string): string {
  return readableNumberLatex(Number(text));
}

/**
 * An arithmetic rate coefficient in LaTeX, e.g. 2 \times 10^{6}\, T^{0.5}\, e^{-6000/T}: numbers in
 * the readable notation, `exp` as a power of e, and a fraction stacked on the line but written
 * with a slash inside an exponent, where a stacked one would be too small to read.
 */
export function rateExpressionLatex(node: RateExpression, inExponent = false): string {
  const latex = (child: RateExpression) => rateExpressionLatex(child, inExponent);
  switch (node.kind) {
    case "number":
      return numberLatex(String(node.value));
    case "parameter":
      return symbolLatex(node.name);
    case "negate":
      return rateExpressionPrecedence(node.operand) < 3 ? `-\\left(${latex(node.operand)}\\right)` : `-${latex(node.operand)}`;
    case "call":
      if (node.name === "exp") return `e^{${rateExpressionLatex(node.argument, true)}}`;
      return node.name === "sqrt" ? `\\sqrt{${latex(node.argument)}}` : `\\ln\\left(${latex(node.argument)}\\right)`;
    case "binary": {
      if (node.operator === "/" && !inExponent) return `\\frac{${latex(node.left)}}{${latex(node.right)}}`;
      const side = (which: "left" | "right") => {
        const written = latex(node[which]);
        // A base that is more than one symbol (a fraction, a number with its power of ten, a power of e) is grouped.
        const compoundBase = node.operator === "^" && which === "left" && (node.left.kind === "binary" || /\^|\\times/.test(written));
        const grouped = operandNeedsParentheses(node, which) || compoundBase;
        return grouped ? `\\left(${written}\\right)` : written;
      };
      if (node.operator === "^") return `${side("left")}^{${rateExpressionLatex(node.right, true)}}`;
      return `${side("left")}${node.operator === "*" ? "\\, " : node.operator === "/" ? "/" : ` ${node.operator} `}${side("right")}`;
    }
  }
}

/** One factor of a coefficient with its power: k_{1}, k_{f}^{2}, 10^{-3}; an expression as its tree. */
export function factorLatex(factor: RateFactor): string {
  if (factor.kind === "expression") {
    // Beside other factors only a sum needs parentheses: a product, power or call reads as one.
    const tree = factor.expression!.tree;
    const latex = rateExpressionLatex(tree);
    return rateExpressionPrecedence(tree) < 2 ? `\\left(${latex}\\right)` : latex;
  }
  const base = factor.kind === "value" ? numberLatex(factor.symbol) : symbolLatex(factor.symbol);
  return factor.power === 1 ? base : `${base}^{${factor.power}}`;
}

export function coefficientLatex(sum: RateFactor[][]): string {
  return sum.map((product) => withoutUnitFactors(product).map(factorLatex).join(" ")).join(" + ");
}

/** A concentration in brackets, so [MQ] and [M][Q] never look alike: [\mathrm{MQ}]^{2}. */
export function concentrationLatex(species: string, power: number): string {
  // Species are upright like every chemical name, one letter or several: [Q] beside [MQ].
  const bracketed = `[${symbolLatex(species).replace(/^[A-Za-z](?=_|$)/, (letter) => `\\mathrm{${letter}}`)}]`;
  return power === 1 ? bracketed : `${bracketed}^{${power}}`;
}

/** A custom law typeset by mathjs, with names in the same notation as everything else. */
export function lawLatex(law: string): string {
  const reading = readLaw(law);
  if (!reading.ok) return `\\text{${escapeLatex(law)}}`;
  const latex = reading.node.toTex({
    parenthesis: "auto",
    implicit: "hide",
    handler: (node: MathNode) => (node.type === "SymbolNode" ? symbolLatex((node as unknown as { name: string }).name) : undefined),
  });
  // mathjs writes \cdot right against its operand: `\cdotS` would be one undefined command.
  return latex.replace(/\\cdot(?=[A-Za-z0-9])/g, "\\cdot ");
}

// ---- linear combinations of species (conservation laws)

/** Weights over species as a sum, e.g. "E + C" or "2A - B"; "0" when every weight is zero. */
export function combinationText(weights: number[], species: string[]): string {
  return combination(weights, species.map(speciesToken), "");
}

/** The same over concentrations in brackets: "[E] + [C]". */
export function combinationLatex(weights: number[], species: string[]): string {
  return combination(weights, species.map((name) => concentrationLatex(name, 1)), "\\,");
}

function combination(weights: number[], names: string[], space: string): string {
  const parts = weights.flatMap((weight, index) => (weight === 0 ? [] : [{ weight, name: names[index] }]));
  if (parts.length === 0) return "0";
  return parts
    .map(({ weight, name }, position) => {
      const sign = weight < 0 ? (position === 0 ? "-" : " - ") : position === 0 ? "" : " + ";
      const magnitude = Math.abs(weight);
      return `${sign}${magnitude === 1 ? "" : `${magnitude}${space}`}${name}`;
    })
    .join("");
}
