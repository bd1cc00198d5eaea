// A mechanism and its induced kinetic ODEs as a complete LaTeX document: article class and amsmath
// only, so that any TeX installation compiles it. Names are typeset the way the analysis already
// writes them (expression.ts); what this module adds is the document around them, text escaping
// and an ASCII-only result (non-ASCII letters and symbols become LaTeX commands).
import type { AnalysisReport } from "~/chem/analysis";
import { concentrationLatex, lawLatex, numberLatex, rateExpressionLatex, symbolLatex } from "~/chem/expression";
import type { Mechanism, RateRef, Step, Term } from "~/chem/model";
import { termBreak } from "~/chem/odes";

/** What the document shows from the structure report. */
export type LatexReport = Pick<AnalysisReport, "species" | "complexes" | "reactions" | "linkageClasses" | "deficiency" | "odesLatex">;

export interface LatexExportOptions {
  title?: string;
}

export function exportLatex(mechanism: Mechanism, report: LatexReport, { title = "Reaction mechanism" }: LatexExportOptions = {}): string {
  const sections = [
    section("Reaction steps", mechanism.steps.length > 0 ? align(mechanism.steps.map(stepRow)) : "The mechanism has no reaction steps."),
    section("Rate coefficients and concentrations", conditions(mechanism)),
    section("Structure", structureSentence(report)),
    section("Induced kinetic differential equations", report.species.length > 0 ? align(report.species.flatMap((name) => odeRows(name, report))) : "There are no species."),
  ];
  const document = [
    "\\documentclass[11pt]{article}",
    "\\usepackage{amsmath}",
    "\\allowdisplaybreaks",
    `\\title{${escapeText(title)}}`,
    "\\date{}",
    "\\begin{document}",
    "\\maketitle",
    ...sections,
    "\\end{document}",
    "",
  ].join("\n");
  return asciiLatex(document);
}

function section(heading: string, body: string): string {
  return `\n\\section*{${heading}}\n${body}`;
}

/** Rows of an align* environment; each row already holds its `&`. */
function align(rows: string[]): string {
  return `\\begin{align*}\n${rows.map((row) => `  ${row}`).join(" \\\\\n")}\n\\end{align*}`;
}

// ---- steps

function stepRow(step: Step): string {
  const label = step.label ? `\\text{${escapeText(step.label)}:}\\quad` : "";
  const rate = step.law !== null ? `\\qquad v = ${lawLatex(step.law)}` : "";
  return `${label} & ${complexLatex(step.reactants)} ${arrow(step)} ${complexLatex(step.products)}${rate}`;
}

function complexLatex(terms: Term[]): string {
  if (terms.length === 0) return "\\emptyset";
  return terms.map(({ coefficient, species }) => `${coefficient === 1 ? "" : `${coefficient}\\,`}${symbolLatex(species)}`).join(" + ");
}

function arrow(step: Step): string {
  if (step.reversible) {
    if (!step.forward || !step.backward) return "\\rightleftharpoons";
    return `\\mathrel{\\underset{${rateLatex(step.backward)}}{\\overset{${rateLatex(step.forward)}}{\\rightleftharpoons}}}`;
  }
  return step.forward ? `\\xrightarrow{${rateLatex(step.forward)}}` : "\\longrightarrow";
}

function rateLatex(rate: RateRef): string {
  if (rate.kind === "expression") return rateExpressionLatex(rate.expression);
  return rate.kind === "value" ? numberLatex(String(rate.value)) : symbolLatex(rate.name);
}

// ---- values

function conditions(mechanism: Mechanism): string {
  // Braces keep a row that starts with [ from being read as the optional argument of \\.
  const concentration = (name: string, initial: boolean) => `{[${symbolLatex(name)}]${initial ? "_0" : ""}}`;
  const rows = [
    ...Object.entries(mechanism.parameters).map(([name, value]) => `${symbolLatex(name)} &= ${numberLatex(String(value))}`),
    ...Object.entries(mechanism.fixed).map(([name, value]) => `${concentration(name, false)} &= ${numberLatex(String(value))} \\quad \\text{(held constant)}`),
    ...Object.entries(mechanism.initial).map(([name, value]) => `${concentration(name, true)} &= ${numberLatex(String(value))}`),
  ];
  const defaults = "Initial concentrations not listed are 0.";
  return rows.length > 0 ? `${align(rows)}\n${defaults}` : defaults;
}

function structureSentence(report: LatexReport): string {
  const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
  return (
    `${count(report.species.length, "species", "species")}, ${count(report.complexes.length, "complex", "complexes")}, ` +
    `${count(report.reactions.length, "reaction", "reactions")} and ${count(report.linkageClasses.length, "linkage class", "linkage classes")}; ` +
    `deficiency ${report.deficiency}.`
  );
}

/**
 * An equation as rows of the align*: the right-hand side broken between terms (where the
 * typeset equation allows a break) so that each row fits the text width of an 11pt article.
 */
function odeRows(name: string, report: LatexReport): string[] {
  const equation = report.odesLatex[name];
  const left = `\\frac{d${concentrationLatex(name, 1)}}{dt} = `;
  if (!equation.startsWith(left)) return [`& ${equation}`];
  const lines: string[][] = [[]];
  for (const term of equation.slice(left.length).split(termBreak)) {
    const line = lines.at(-1)!;
    if (line.length > 0 && visibleWidth([...line, term].join(" ")) > rowWidth) lines.push([term]);
    else line.push(term);
  }
  return lines.map((terms, index) => (index === 0 ? `${left.slice(0, -3)} &= ${terms.join(" ")}` : `&\\quad {}${terms.join(" ")}`));
}

/** Characters of maths a row's right-hand side may hold: 360pt of text width, some 6pt each. */
const rowWidth = 44;

/** Roughly how many characters wide typeset LaTeX is: every command one symbol, spacing nothing. */
function visibleWidth(latex: string): number {
  return latex
    .replace(/\\(left|right|mathrm|allowbreak|text)(?![A-Za-z])/g, "")
    .replace(/\\[,;!]/g, "")
    .replace(/\\[A-Za-z]+/g, "M")
    .replace(/[{}\s^_]/g, "").length;
}

// ---- text

const textEscapes: Record<string, string> = {
  "\\": "\\textbackslash{}",
  "{": "\\{",
  "}": "\\}",
  $: "\\$",
  "&": "\\&",
  "#": "\\#",
  "^": "\\^{}",
  _: "\\_",
  "%": "\\%",
  "~": "\\~{}",
  "<": "\\textless{}",
  ">": "\\textgreater{}",
  "|": "\\textbar{}",
  '"': "{''}",
};

/** Text-mode escaping for titles and labels: every character LaTeX treats specially. */
function escapeText(text: string): string {
  return text.replace(/[\\{}$&#^_%~<>|"]/g, (char) => textEscapes[char]).replace(/\s+/g, " ");
}

/** Greek letters in code-point order; those without a command of their own look like Latin capitals. */
const greekLetters = "αβγδεζηθικλμνξοπρςστυφχψωΑΒΓΔΕΖΗΘΙΚΛΜΝΞΟΠΡΣΤΥΦΧΨΩ";
const greekLatex = [
  ..."alpha beta gamma delta epsilon zeta eta theta iota kappa lambda mu nu xi omicron pi rho varsigma sigma tau upsilon phi chi psi omega".split(" "),
  ..."A B Gamma Delta E Z H Theta I K Lambda M N Xi O Pi P Sigma T Upsilon Phi X Psi Omega".split(" "),
].map((name) => (name === "omicron" ? "o" : name.length === 1 ? `\\mathrm{${name}}` : `\\${name}`));

const combiningAccents: Record<string, string> = {
  "\u0300": "`", "\u0301": "'", "\u0302": "^", "\u0303": "~", "\u0304": "=", "\u0306": "u", "\u0307": ".",
  "\u0308": '"', "\u030A": "r", "\u030B": "H", "\u030C": "v", "\u0327": "c", "\u0328": "k",
};

const symbols: Record<string, string> = {
  "ß": "\\text{\\ss}", "æ": "\\text{\\ae}", "Æ": "\\text{\\AE}", "ø": "\\text{\\o}", "Ø": "\\text{\\O}", "œ": "\\text{\\oe}",
  "Œ": "\\text{\\OE}", "ł": "\\text{\\l}", "Ł": "\\text{\\L}", "µ": "\\ensuremath{\\mu}", "→": "\\ensuremath{\\rightarrow}",
  "←": "\\ensuremath{\\leftarrow}", "⇌": "\\ensuremath{\\rightleftharpoons}", "⇄": "\\ensuremath{\\rightleftharpoons}",
  "∅": "\\ensuremath{\\emptyset}", "·": "\\ensuremath{\\cdot}", "×": "\\ensuremath{\\times}", "±": "\\ensuremath{\\pm}",
  "°": "\\ensuremath{^\\circ}", "−": "\\ensuremath{-}", "–": "\\text{--}", "—": "\\text{---}", "‘": "\\text{`}", "’": "\\text{'}",
  "“": "\\text{``}", "”": "\\text{''}", "\u00A0": "~", "⁺": "\\ensuremath{^{+}}", "⁻": "\\ensuremath{^{-}}",
};

/**
 * Replaces every character outside printable ASCII (bar tab and line ends) by a LaTeX command
 * that typesets it, so that any engine reads the file.
 */
function asciiLatex(text: string): string {
  return text.replace(/[^\t\n\r\x20-\x7E]/gu, (char) => symbols[char] ?? greek(char) ?? accented(char) ?? scripted(char) ?? codePoint(char));
}

function greek(char: string): string | null {
  const index = greekLetters.indexOf(char);
  return index < 0 ? null : `\\ensuremath{${greekLatex[index]}}`;
}

function accented(char: string): string | null {
  const [base, ...marks] = [...char.normalize("NFD")];
  if (marks.length === 0 || !/^[A-Za-z]$/.test(base) || marks.some((mark) => !(mark in combiningAccents))) return null;
  const letter = base === "i" || base === "j" ? `\\${base}` : base;
  return `\\text{${marks.reduce((inner, mark) => `\\${combiningAccents[mark]}{${inner}}`, letter)}}`;
}

const superscripts = "⁰¹²³⁴⁵⁶⁷⁸⁹";
const subscripts = "₀₁₂₃₄₅₆₇₈₉";

function scripted(char: string): string | null {
  if (superscripts.includes(char)) return `\\ensuremath{^{${superscripts.indexOf(char)}}}`;
  if (subscripts.includes(char)) return `\\ensuremath{_{${subscripts.indexOf(char)}}}`;
  return null;
}

function codePoint(char: string): string {
  return `\\text{[U+${char.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")}]}`;
}
