// Reads `.weave` text into a Mechanism with diagnostics a chemist can act on. The Lezer parser
// gives the tree (and its error recovery keeps later lines readable); this module gives meaning.
import { TreeFragment, type SyntaxNode, type Tree } from "@lezer/common";
import { parser } from "../../grammar/parser";
import { lawConstants, readLaw } from "./law";
import { elementBalance } from "./balance";
import { readFormula } from "./formula";
import type { Diagnostic, Mechanism, ParseResult, RateExpression, RateRef, Severity, Step, Term } from "./model";
import { zeroRateDirections } from "./network";
import { evaluateRateExpression, isRateFunction, RATE_FUNCTIONS, rateExpressionText } from "./rate-expression";

import { listed } from "./listed";
import { speciesToken } from "./print";

export { printMechanism } from "./print";
export { checkSourceLimits } from "./limits";

export function parseMechanism(source: string): ParseResult {
  return new MechanismReader(source, parser.parse(source)).read();
}

/** Values given from outside the text (the CLI's `--set`), as if the text declared them. */
export interface Settings {
  parameters: Record<string, number>;
  initial: Record<string, number>;
}

/**
 * Parses with some parameters and initial concentrations replaced; every diagnostic (a rate
 * coefficient set to 0 included) sees the replaced values. `unknown` names the settings that match
 * no parameter, or no species that is not fixed, of the text; they are not applied.
 */
export function parseMechanismWithSettings(source: string, settings: Settings): ParseResult & { unknown: string[] } {
  const reader = new MechanismReader(source, parser.parse(source), settings);
  return { ...reader.read(), unknown: reader.unknownSettings };
}

/**
 * Parses successive versions of a text, reusing the syntax tree of what did not change: a
 * keystroke in a 200-step mechanism costs a fraction of a full parse. The result is the same as
 * parseMechanism's; any text may follow any other (a very different one is simply parsed anew).
 */
export class IncrementalMechanismParser {
  private previous: { source: string; tree: Tree } | null = null;

  parse(source: string): ParseResult {
    const fragments = this.previous ? TreeFragment.applyChanges(TreeFragment.addTree(this.previous.tree), [changedRange(this.previous.source, source)]) : undefined;
    const tree = parser.parse(source, fragments);
    this.previous = { source, tree };
    return new MechanismReader(source, tree).read();
  }
}

/** The one range where two texts differ, between their common start and common end. */
function changedRange(before: string, after: string) {
  const shorter = Math.min(before.length, after.length);
  let start = 0;
  while (start < shorter && before.charCodeAt(start) === after.charCodeAt(start)) start++;
  let end = 0;
  while (end < shorter - start && before.charCodeAt(before.length - 1 - end) === after.charCodeAt(after.length - 1 - end)) end++;
  return { fromA: start, toA: before.length - end, fromB: start, toB: after.length - end };
}

/** Characters that can begin some token of the language; anything else is an unknown character. */
const tokenStart = /[A-Za-z0-9 \t\r\n"#+@,=:[\]{}<\-→⇌⇄∅*/^()]/;

const statementHint =
  "write a step (X + Y -> 2Y @ k), a parameter (k = 1.0), an initial concentration ([X]0 = 1.5) or a fixed species (fixed [A] = 2.0)";

interface Span {
  from: number;
  to: number;
}

interface NameUse extends Span {
  name: string;
}

interface Declared extends Span {
  value: number;
}

/** A syntax problem; on each line only the most telling one is reported, to avoid cascades. */
interface SyntaxProblem extends Span {
  /** Lower is more telling: an unknown character explains more than what the parser expected. */
  priority: number;
  message: string;
}

class MechanismReader {
  private readonly lineStarts: number[] = [0];
  private readonly diagnostics: Diagnostic[] = [];
  private readonly brokenAt: number[] = [];
  private readonly steps: Step[] = [];
  /** complexKey of each step's two sides, parallel to `steps`. */
  private readonly stepKeys: { reactants: string; products: string }[] = [];
  private readonly labels = new Map<string, number>();
  private readonly parameters = new Map<string, Declared>();
  /** Names given a value, valid or not, so that an invalid value is not also "never given". */
  private readonly attemptedParameters = new Set<string>();
  private readonly parameterUses: NameUse[] = [];
  private readonly lawUses: { symbols: string[]; span: Span }[] = [];
  /** Rate coefficients written as expressions, checked once every parameter is known. */
  private readonly expressionUses: { expression: RateExpression; span: Span }[] = [];
  private readonly speciesSeen = new Map<string, Span>();
  private readonly initial = new Map<string, Declared>();
  private readonly fixed = new Map<string, Declared>();
  /** Where the text says `balanced`, if it does. */
  private balancedAt: Span | null = null;
  /** Declared formulas that could be read, by species. */
  private readonly formulas = new Map<string, Span & { formula: string }>();

  readonly unknownSettings: string[] = [];

  constructor(
    private readonly source: string,
    private readonly tree: Tree,
    private readonly settings: Settings = { parameters: {}, initial: {} },
  ) {
    for (let i = 0; i < source.length; i++) if (source.charCodeAt(i) === 10) this.lineStarts.push(i + 1);
  }

  read(): ParseResult {
    const { tree } = this;
    this.collectSyntaxProblems(tree);
    for (let node = tree.topNode.firstChild; node; node = node.nextSibling) {
      if (this.isBroken(node)) continue;
      if (node.name === "Step") this.readStep(node);
      else if (node.name === "Parameter") this.readParameter(node);
      else if (node.name === "Initial") this.readDeclaration(node, this.initial, "an initial concentration");
      else if (node.name === "Fixed") this.readDeclaration(node, this.fixed, "a fixed concentration");
      else if (node.name === "Balanced") this.readBalanced(node);
      else if (node.name === "Formula") this.readFormulaDeclaration(node);
    }
    this.applySettings();
    const mechanism = this.mechanism();
    this.checkNames(mechanism);
    this.checkDuplicateSteps(mechanism);
    this.checkExpressions(mechanism);
    this.checkZeroRates(mechanism);
    this.checkElementBalance(mechanism);
    this.diagnostics.sort((a, b) => a.from - b.from || a.to - b.to);
    return { mechanism, diagnostics: this.diagnostics };
  }

  // ---- positions and reporting

  private report(severity: Severity, span: Span, message: string): void {
    const { line, column } = this.position(span.from);
    this.diagnostics.push({ severity, line, column, message, from: span.from, to: Math.max(span.to, span.from) });
  }

  private lineOf(offset: number): number {
    let low = 0;
    let high = this.lineStarts.length - 1;
    while (low < high) {
      const middle = (low + high + 1) >> 1;
      if (this.lineStarts[middle] <= offset) low = middle;
      else high = middle - 1;
    }
    return low + 1;
  }

  private position(offset: number): { line: number; column: number } {
    const line = this.lineOf(offset);
    return { line, column: offset - this.lineStarts[line - 1] + 1 };
  }

  private text(node: Span): string {
    return this.source.slice(node.from, node.to);
  }

  // ---- syntax

  private collectSyntaxProblems(tree: Tree): void {
    const problems: SyntaxProblem[] = [];
    tree.iterate({
      enter: (ref) => {
        if (ref.type.isError) problems.push(this.describeError(ref.node));
        else if (ref.name === "QuotedName") {
          const problem = this.quotedNameProblem(ref.node);
          if (problem) problems.push(problem);
        }
      },
    });
    const bestPerLine = new Map<number, SyntaxProblem>();
    for (const problem of problems) {
      this.brokenAt.push(problem.from);
      const line = this.lineOf(problem.from);
      const best = bestPerLine.get(line);
      if (!best || problem.priority < best.priority || (problem.priority === best.priority && problem.from < best.from)) {
        bestPerLine.set(line, problem);
      }
    }
    for (const problem of bestPerLine.values()) this.report("error", problem, problem.message);
    this.brokenAt.sort((a, b) => a - b);
  }

  /** Whether a syntax problem sits on the statement's lines: then nothing of it is trusted. */
  private isBroken(statement: SyntaxNode): boolean {
    const from = this.lineStarts[this.lineOf(statement.from) - 1];
    const to = this.lineStarts[this.lineOf(statement.to)] ?? this.source.length + 1;
    let low = 0;
    let high = this.brokenAt.length;
    while (low < high) {
      const middle = (low + high) >> 1;
      if (this.brokenAt[middle] < from) low = middle + 1;
      else high = middle;
    }
    return low < this.brokenAt.length && this.brokenAt[low] < to;
  }

  private quotedNameProblem(node: SyntaxNode): SyntaxProblem | null {
    const text = this.text(node);
    if (text.length < 2 || !text.endsWith('"')) {
      return { from: node.from, to: node.to, priority: 1, message: `The quoted name ${text} is not closed: add " before the end of the line.` };
    }
    if (text === '""') return { from: node.from, to: node.to, priority: 1, message: "A quoted species name cannot be empty." };
    return null;
  }

  private describeError(node: SyntaxNode): SyntaxProblem {
    const end = Math.max(node.to, node.from + 1);
    for (let i = node.from; i < end && i < this.source.length; i++) {
      const char = this.source[i];
      if (char === '"') break;
      if (char === ">" || char === "<") {
        // The rest of a well-formed arrow (->, <=>, <->) here means a second arrow on the line.
        const arrowHere =
          char === ">"
            ? /(^|[^<=])->$|<[-=]>$/.test(this.source.slice(Math.max(0, i - 2), i + 1))
            : /^<[-=]>/.test(this.source.slice(i, i + 3));
        const message = arrowHere
          ? "A step has one arrow: split a chain such as A -> B -> C into two steps."
          : "Unknown arrow: write -> for one direction or <=> for both.";
        return { from: i, to: i + 1, priority: 0, message };
      }
      if (!tokenStart.test(char)) {
        return {
          from: i,
          to: i + 1,
          priority: 0,
          message: `Unknown character ${describeCharacter(char)}: species names use letters, digits and _, or double quotes ("Fe3+").`,
        };
      }
    }
    return { from: node.from, to: node.to, priority: 2, message: this.expectation(node) };
  }

  /** What the text should have held at an error, judged from the token just before it. */
  private expectation(error: SyntaxNode): string {
    const before = this.tokenBefore(error);
    if (!before || this.lineOf(before.to) !== this.lineOf(error.from)) {
      return `This line cannot be read: ${statementHint}.`;
    }
    // The two contextual keywords may also be names, so the start of the line tells which was meant.
    const lineText = this.source.slice(this.lineStarts[this.lineOf(error.from) - 1], error.from);
    if (/^\s*formula\s*\[/.test(lineText)) return 'Write a formula as formula [Glc] = C6H12O6, a charged one in quotes: formula [Ox] = "C2O4^2-".';
    if (/^\s*balanced\s*[^\s+:=<\-→⇌⇄]/.test(lineText + this.source.slice(error.from, error.from + 1))) return "balanced stands alone on its line.";
    // The error may sit outside any statement node; the token before it tells what was being read.
    const statement = this.statementOf(before);
    switch (before.name) {
      case "+":
        return "Expected a species after +.";
      case "ForwardArrow":
      case "ReversibleArrow":
        return "Expected a complex after the arrow: species such as 2X + Y, or 0 for nothing.";
      case "@":
        return "Expected a rate coefficient after @: a number (1.5e-3), a name (k1), name = number, or a rate law in { }.";
      case ",":
        return "Expected the backward rate coefficient after the comma.";
      case "=":
        return "Expected a number here, such as 1.5 or 2e-3.";
      case "*":
      case "/":
      case "^":
      case "-":
      case "(":
        return "Expected a number, a parameter or a parenthesised expression here.";
      case "{":
      case "LawText":
        return "Expected a rate law closed by }, such as { Vmax*S/(Km + S) }.";
      case "[":
        return "Expected a species name inside [ ].";
      case "fixed":
        return "Write a fixed species as fixed [A] = 2.0.";
      case ":":
        return "Expected a reaction step after the label.";
      case "]":
      case "InitialClose":
        return "Expected = and a concentration.";
    }
    const zero = "0 is the empty complex and stands alone: write 0, or species, not both.";
    if (before.parent?.name === "Zero" || (before.parent?.name === "Term" && Number(this.text(before)) === 0)) return zero;
    if (before.name === "Number" && before.parent?.name === "Term") return `Expected a species after the coefficient ${this.text(before)}.`;
    if (statement?.name === "Initial") return "Write an initial concentration as [X]0 = 1.5.";
    if (statement?.name === "Fixed") return "Write a fixed species as fixed [A] = 2.0.";
    if (statement?.name === "Parameter") return "Expected the end of the line after the parameter's value.";
    if (this.insideRate(before) || before.name === "}") {
      return "Expected the end of the line after the rate (a reversible step takes two, separated by a comma).";
    }
    const arrowSeen = statement?.getChild("ForwardArrow") ?? statement?.getChild("ReversibleArrow");
    if (arrowSeen && arrowSeen.from < error.from) return "Expected + or @ and a rate coefficient here.";
    return "Expected + or an arrow (-> or <=>) here.";
  }

  private insideRate(node: SyntaxNode): boolean {
    for (let at = node.parent; at && at.name !== "Step"; at = at.parent) if (at.name === "Rate") return true;
    return false;
  }

  private tokenBefore(node: SyntaxNode): SyntaxNode | null {
    let at: SyntaxNode | null = node;
    while (at && !at.prevSibling) at = at.parent;
    let previous = at?.prevSibling ?? null;
    while (previous && previous.type.isError) previous = previous.lastChild ?? previous.prevSibling;
    while (previous?.lastChild) previous = previous.lastChild;
    return previous;
  }

  private statementOf(node: SyntaxNode): SyntaxNode | null {
    let at: SyntaxNode | null = node;
    while (at && at.parent && at.parent.name !== "Mechanism") at = at.parent;
    return at && at.name !== "Mechanism" ? at : null;
  }

  // ---- statements

  private readStep(node: SyntaxNode): void {
    const [left, right] = node.getChildren("Complex");
    const reactants = this.readComplex(left);
    const products = this.readComplex(right);
    if (!reactants || !products) return;
    const reversible = node.getChild("ReversibleArrow") !== null;
    const keys = { reactants: complexKey(reactants), products: complexKey(products) };
    if (keys.reactants === keys.products) {
      this.report("error", node, `The same complex ${keys.reactants} is on both sides: this step changes nothing.`);
      return;
    }
    const step: Step = {
      label: this.readLabel(node.getChild("Label")),
      reactants,
      products,
      reversible,
      forward: null,
      backward: null,
      law: null,
      line: this.lineOf(node.from),
      from: node.from,
      to: node.to,
    };
    const ratePart = node.getChild("RatePart");
    if (!ratePart) {
      this.report("warning", node, "No rate coefficient: the structure is analysed, but a simulation needs one (add @ k1 or @ 1.5).");
    } else if (!this.readRatePart(ratePart, step)) {
      return;
    }
    this.steps.push(step);
    this.stepKeys.push(keys);
  }

  private readLabel(node: SyntaxNode | null): string | null {
    if (!node) return null;
    const label = this.text(node);
    const earlier = this.labels.get(label);
    if (earlier !== undefined) {
      this.report("error", node, `The label ${label} is already used on line ${earlier}.`);
    } else {
      this.labels.set(label, this.lineOf(node.from));
    }
    return label;
  }

  private readComplex(node: SyntaxNode): Term[] | null {
    const zero = node.getChild("Zero");
    if (zero) {
      const number = zero.getChild("Number");
      if (number && Number(this.text(number)) !== 0) {
        this.report("error", number, `A complex is 0 or species such as 2X + Y; ${this.text(number)} alone is not a complex.`);
        return null;
      }
      return [];
    }
    const terms: Term[] = [];
    for (const term of node.getChildren("Term")) {
      const species = this.readSpecies(term.getChild("Species")!);
      const number = term.getChild("Number");
      const coefficient = number ? this.readCoefficient(number, species) : 1;
      if (coefficient === null) return null;
      terms.push({ coefficient, species });
    }
    return terms;
  }

  private readCoefficient(node: SyntaxNode, species: string): number | null {
    const text = this.text(node);
    const value = Number(text);
    if (value === 0) {
      this.report("error", node, `A coefficient of 0 removes ${species}; leave the term out instead.`);
    } else if (!Number.isInteger(value) || value < 0) {
      this.report("error", node, `A coefficient counts molecules, so it is a positive whole number; ${text} is not.`);
    } else if (!Number.isSafeInteger(value)) {
      this.report("error", node, `The coefficient ${text} is too large.`);
    } else {
      return value;
    }
    return null;
  }

  private readSpecies(node: SyntaxNode): string {
    const name = this.unquoted(node);
    if (!this.speciesSeen.has(name)) this.speciesSeen.set(name, node);
    return name;
  }

  /** A name as meant: the text between the quotes of a quoted one. */
  private unquoted(node: SyntaxNode): string {
    const text = this.text(node);
    return text.startsWith('"') ? text.slice(1, text.endsWith('"') ? -1 : undefined) : text;
  }

  /** Fills the step's rates or law; false when the step cannot be used at all. */
  private readRatePart(node: SyntaxNode, step: Step): boolean {
    const law = node.getChild("Law");
    if (law) return this.readLaw(law, step);
    const rates = node.getChildren("Rate").map((rate) => this.readRate(rate));
    const wanted = step.reversible ? 2 : 1;
    if (rates.length < wanted) {
      this.report("error", node, "A reversible step needs two rate coefficients, forward and backward: @ kf, kb.");
    } else if (rates.length > wanted) {
      this.report(
        "error",
        node,
        step.reversible
          ? "A reversible step takes exactly two rate coefficients, forward and backward."
          : "An irreversible step takes one rate coefficient; for two directions use <=> and give both.",
      );
    }
    step.forward = rates[0] ?? null;
    step.backward = step.reversible ? (rates[1] ?? null) : null;
    return true;
  }

  private readLaw(node: SyntaxNode, step: Step): boolean {
    if (step.reversible) {
      this.report("error", node, "A custom rate law describes one direction: write the two directions as separate steps with ->.");
      return true;
    }
    const body = node.getChild("LawText");
    if (!body) {
      this.report("error", node, "The rate law is empty: write an expression inside { }.");
      return false;
    }
    const text = this.text(body).trim();
    const reading = readLaw(text);
    if (!reading.ok) {
      const at = body.from + reading.offset;
      this.report("error", { from: at, to: body.to }, reading.message);
      return false;
    }
    step.law = text;
    this.lawUses.push({ symbols: reading.symbols, span: body });
    return true;
  }

  private readRate(node: SyntaxNode): RateRef | null {
    const body = node.firstChild;
    if (!body) return null;
    if (node.getChild("=")) {
      const parameter = this.useParameter(body);
      this.declareParameter(parameter, body, node);
      return { kind: "parameter", name: parameter };
    }
    if (body.name === "Number") {
      const value = this.readNonNegative(body, "A rate coefficient");
      return value === null ? null : { kind: "value", value };
    }
    if (body.name === "ParameterName") return { kind: "parameter", name: this.useParameter(body) };
    const expression = this.readExpression(body);
    if (!expression) return null;
    this.expressionUses.push({ expression, span: body });
    return { kind: "expression", expression };
  }

  private useParameter(node: SyntaxNode): string {
    const name = this.text(node);
    this.parameterUses.push({ name, from: node.from, to: node.to });
    return name;
  }

  /** The tree of an arithmetic rate coefficient; null (reported) when it calls an unknown function. */
  private readExpression(node: SyntaxNode): RateExpression | null {
    switch (node.name) {
      case "Number":
        return { kind: "number", value: Number(this.text(node)) };
      case "ParameterName":
        return { kind: "parameter", name: this.useParameter(node) };
      case "Group":
        return this.readExpression(node.firstChild!.nextSibling!);
      case "Negation": {
        const operand = this.readExpression(node.lastChild!);
        return operand && { kind: "negate", operand };
      }
      case "Call": {
        const name = this.text(node.getChild("FunctionName")!);
        const argument = this.readExpression(node.getChild("(")!.nextSibling!);
        if (!isRateFunction(name)) {
          this.report("error", node.getChild("FunctionName")!, `${name}() is not a function a rate coefficient may use; use ${RATE_FUNCTIONS.join(", ")}, or a custom rate law in { }.`);
          return null;
        }
        return argument && { kind: "call", name, argument };
      }
      case "BinaryExpression": {
        const left = this.readExpression(node.firstChild!);
        const operator = this.text(node.getChild("ArithOp")!) as "+" | "-" | "*" | "/" | "^";
        const right = this.readExpression(node.lastChild!);
        return left && right && { kind: "binary", operator, left, right };
      }
    }
    return null;
  }

  /** A declared value: the statement's number with the minus sign before it, if any. */
  private signedValue(statement: SyntaxNode, what: string): number | null {
    const number = statement.getChild("Number")!;
    const sign = number.prevSibling?.name === "-" ? number.prevSibling : null;
    return this.readNonNegative({ from: (sign ?? number).from, to: number.to }, what);
  }

  private readNonNegative(node: Span, what: string): number | null {
    const text = this.text(node);
    const value = Number(text);
    if (!Number.isFinite(value)) {
      this.report("error", node, `${what} must be a finite number; ${text} is not.`);
      return null;
    }
    if (value < 0) {
      this.report("error", node, `${what} cannot be negative; ${text} is.`);
      return null;
    }
    return value;
  }

  private readParameter(node: SyntaxNode): void {
    const name = node.getChild("ParameterName")!;
    this.declareParameter(this.text(name), name, node);
  }

  /** `statement` holds the name's `= value` (a parameter line, or a rate declared inline). */
  private declareParameter(name: string, at: SyntaxNode, statement: SyntaxNode): void {
    this.attemptedParameters.add(name);
    const value = this.signedValue(statement, `The value of ${name}`);
    if (value === null) return;
    const earlier = this.parameters.get(name);
    if (earlier) {
      this.report("error", at, `${name} is already given a value on line ${this.lineOf(earlier.from)}.`);
      return;
    }
    this.parameters.set(name, { value, from: at.from, to: at.to });
  }

  private readDeclaration(node: SyntaxNode, into: Map<string, Declared>, what: string): void {
    const speciesNode = node.getChild("Species")!;
    const species = this.readSpecies(speciesNode);
    const value = this.signedValue(node, "A concentration");
    if (value === null) return;
    const earlier = into.get(species);
    if (earlier) {
      this.report("error", speciesNode, `${species} already has ${what} on line ${this.lineOf(earlier.from)}.`);
      return;
    }
    into.set(species, { value, from: speciesNode.from, to: speciesNode.to });
  }

  private readBalanced(node: SyntaxNode): void {
    if (this.balancedAt) {
      this.report("warning", node, `The mechanism is already declared balanced on line ${this.lineOf(this.balancedAt.from)}.`);
      return;
    }
    this.balancedAt = node;
  }

  private readFormulaDeclaration(node: SyntaxNode): void {
    const speciesNode = node.getChild("Species")!;
    const species = this.readSpecies(speciesNode);
    const formulaNode = node.getChild("FormulaText")!;
    const formula = this.unquoted(formulaNode);
    const reading = readFormula(formula);
    const earlier = this.formulas.get(species);
    if (!reading.ok) {
      this.report("warning", formulaNode, `${formula} cannot be read as a formula: ${reading.problem}`);
    } else if (earlier) {
      this.report("warning", speciesNode, `${species} already has a formula on line ${this.lineOf(earlier.from)}.`);
    } else {
      this.formulas.set(species, { formula, from: speciesNode.from, to: speciesNode.to });
    }
  }

  // ---- whole-text checks

  private applySettings(): void {
    for (const [name, value] of Object.entries(this.settings.parameters)) {
      const known = this.parameters.get(name) ?? this.parameterUses.find((use) => use.name === name) ?? this.lawUses.find((use) => use.symbols.includes(name))?.span;
      if (!known || this.speciesSeen.has(name)) {
        this.unknownSettings.push(name);
        continue;
      }
      this.attemptedParameters.add(name);
      this.parameters.set(name, { value, from: known.from, to: known.to });
    }
    for (const [species, value] of Object.entries(this.settings.initial)) {
      const seen = this.speciesSeen.get(species);
      if (!seen || this.fixed.has(species)) {
        this.unknownSettings.push(`[${species}]0`);
        continue;
      }
      this.initial.set(species, { value, from: seen.from, to: seen.to });
    }
  }

  private mechanism(): Mechanism {
    const species: string[] = [];
    const seen = new Set<string>();
    for (const step of this.steps) {
      for (const { species: name } of [...step.reactants, ...step.products]) {
        if (!seen.has(name) && !this.fixed.has(name)) species.push(name);
        seen.add(name);
      }
    }
    return {
      steps: this.steps,
      species,
      fixed: valuesOf(this.fixed),
      parameters: valuesOf(this.parameters),
      initial: valuesOf(this.initial),
      ...(this.balancedAt && { elementBalance: { formulas: Object.fromEntries([...this.formulas].map(([name, { formula }]) => [name, formula])) } }),
    };
  }

  private checkNames(mechanism: Mechanism): void {
    const inSteps = new Set(mechanism.steps.flatMap((step) => [...step.reactants, ...step.products].map((term) => term.species)));
    const clashes = new Set<string>();
    const parameterSpans: NameUse[] = [
      ...[...this.parameters].map(([name, span]) => ({ name, from: span.from, to: span.to })),
      ...this.parameterUses,
    ].sort((a, b) => a.from - b.from);
    for (const use of parameterSpans) {
      if (this.speciesSeen.has(use.name) && !clashes.has(use.name)) {
        clashes.add(use.name);
        const where = this.lineOf(this.speciesSeen.get(use.name)!.from);
        this.report("error", use, `${use.name} is a species (line ${where}), so it cannot also be a parameter; rename one of them.`);
      }
    }
    const reported = new Set<string>();
    for (const use of this.parameterUses) {
      if (this.attemptedParameters.has(use.name) || clashes.has(use.name) || reported.has(use.name)) continue;
      reported.add(use.name);
      this.report("error", use, `${use.name} is used but never given a value: add a line ${use.name} = …`);
    }
    for (const { symbols, span } of this.lawUses) {
      for (const symbol of symbols) {
        const known = inSteps.has(symbol) || this.fixed.has(symbol) || this.parameters.has(symbol) || (lawConstants.has(symbol) && !this.speciesSeen.has(symbol));
        if (!known) {
          const at = this.text(span).search(new RegExp(`\\b${symbol}\\b`));
          this.report("error", { from: span.from + Math.max(at, 0), to: span.from + Math.max(at, 0) + symbol.length }, `The rate law uses ${symbol}, which is neither a species in a step nor a parameter with a value: add a line ${symbol} = …`);
        }
      }
    }
    for (const [name, span] of this.initial) {
      if (this.fixed.has(name)) this.report("warning", span, `${name} is fixed; its initial concentration is not used.`);
      else if (!inSteps.has(name)) this.report("warning", span, `${name} takes part in no step; its initial concentration is not used.`);
    }
    for (const [name, span] of this.fixed) {
      if (!inSteps.has(name)) this.report("warning", span, `${name} is fixed but takes part in no step.`);
    }
  }

  private checkDuplicateSteps(mechanism: Mechanism): void {
    const firstLine = new Map<string, number>();
    mechanism.steps.forEach((step, index) => {
      const { reactants, products } = this.stepKeys[index];
      const directions = step.reversible ? [`${reactants} -> ${products}`, `${products} -> ${reactants}`] : [`${reactants} -> ${products}`];
      for (const reaction of directions) {
        const line = firstLine.get(reaction);
        if (line === undefined) {
          firstLine.set(reaction, step.line);
        } else {
          this.report("warning", step, `This step repeats the reaction ${reaction} of line ${line}; they are merged and their rate coefficients add.`);
        }
      }
      const unchanged = (terms: Term[]) => terms.filter((term) => !this.fixed.has(term.species));
      const touchesFixed = this.fixed.size > 0 && [...step.reactants, ...step.products].some((term) => this.fixed.has(term.species));
      if (touchesFixed && complexKey(unchanged(step.reactants)) === complexKey(unchanged(step.products))) {
        this.report("warning", step, "With its fixed species held constant this step changes no concentration; the structure leaves it out.");
      }
    });
  }

  /** An expression must have a value at the parameters given, and it must not be negative. */
  private checkExpressions(mechanism: Mechanism): void {
    for (const { expression, span } of this.expressionUses) {
      const evaluation = evaluateRateExpression(expression, mechanism.parameters);
      if (!evaluation.ok) {
        if (evaluation.problem) this.report("error", span, `This rate coefficient has no value: ${evaluation.problem}`);
      } else if (evaluation.value < 0) {
        const negativeNumber = expression.kind === "negate" && expression.operand.kind === "number";
        const value = negativeNumber ? "" : ` ${Number(evaluation.value.toPrecision(6))}`;
        this.report("error", span, `A rate coefficient cannot be negative; ${rateExpressionText(expression)} is${value}.`);
      }
    }
  }

  /** With `balanced`, each step that loses or gains atoms or charge is told so on its line. */
  private checkElementBalance(mechanism: Mechanism): void {
    const inSteps = new Set(mechanism.steps.flatMap((step) => [...step.reactants, ...step.products].map((term) => term.species)));
    for (const [name, span] of this.formulas) {
      if (!inSteps.has(name)) this.report("warning", span, `${name} takes part in no step; its formula is not used.`);
    }
    const report = elementBalance(mechanism);
    if (!report) {
      const first = [...this.formulas.values()].sort((a, b) => a.from - b.from)[0];
      if (first) this.report("warning", first, "Formulas are used by the element balance, which is off: add a line balanced to check every step.");
      return;
    }
    report.steps.forEach(({ message }, index) => {
      if (message) this.report("warning", mechanism.steps[index], message);
    });
    if (report.unreadable.length > 0) {
      const unchecked = report.steps.filter((step) => !step.checked).length;
      const names = listed(report.unreadable);
      const example = speciesToken(report.unreadable[0]);
      this.report(
        "warning",
        this.balancedAt!,
        `${names} ${report.unreadable.length === 1 ? "is not a formula" : "are not formulas"}, so ${unchecked === 1 ? "1 step is" : `${unchecked} steps are`} not checked for balance; declare one as formula [${example}] = … if it is a compound.`,
      );
    }
  }

  /** The network leaves out what never runs (see buildNetwork); the author is told on the step's line. */
  private checkZeroRates(mechanism: Mechanism): void {
    for (const step of mechanism.steps) {
      const [forward, backward] = zeroRateDirections(mechanism, step);
      if (forward && (backward || !step.reversible)) this.report("warning", step, "rate coefficient 0: step left out of the network");
      else if (forward || backward) this.report("warning", step, `rate coefficient 0: ${forward ? "forward" : "backward"} direction left out of the network`);
    }
  }
}

/** A character as a reader can recognise it: invisible ones (a no-break space) by code point. */
function describeCharacter(char: string): string {
  const visible = /\S/.test(char) && !/\p{C}/u.test(char);
  return visible ? `"${char}"` : `U+${char.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")} (invisible)`;
}

/** A complex's identity independent of term order and repetition, e.g. `2X + Y`. */
function complexKey(terms: Term[]): string {
  if (terms.length === 1) return terms[0].coefficient === 1 ? terms[0].species : `${terms[0].coefficient}${terms[0].species}`;
  const totals = new Map<string, number>();
  for (const { species, coefficient } of terms) totals.set(species, (totals.get(species) ?? 0) + coefficient);
  const names = [...totals.keys()].sort();
  if (names.length === 0) return "0";
  return names.map((name) => (totals.get(name) === 1 ? name : `${totals.get(name)}${name}`)).join(" + ");
}

function valuesOf(declared: Map<string, Declared>): Record<string, number> {
  const values: Record<string, number> = {};
  for (const [name, { value }] of declared) values[name] = value;
  return values;
}
