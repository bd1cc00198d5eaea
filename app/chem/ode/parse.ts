// Reads a `.ode` text: `x' = …` or `dx/dt = …` equations, `name = number` parameters and
// `x(0) = number` initial values, one a line, `#` comments. Right-hand sides are parsed with mathjs
// and expanded to exact polynomials; every problem becomes a diagnostic with line and column.
import { parse as parseMath } from "mathjs";
import type { MathNode } from "mathjs";
import type { Diagnostic, PolynomialOde } from "../model";
import type { ExactOde } from "./exact";
import { toPolynomialOde } from "./exact";
import { NotPolynomial, toPolynomial } from "./expression";
import type { Scope } from "./expression";
import * as P from "./polynomial";
import type { Polynomial } from "./polynomial";
import * as Q from "../linalg/rational";
import { splitSummands } from "./summands";
import type { Span } from "./summands";

/** A written stretch of the ODE text with the 1-based line and column where it starts. */
export interface SourceSpan extends Span {
  line: number;
  column: number;
}

/** Where an equation and each of its expanded terms were written, for editor highlighting. */
export interface EquationSource {
  variable: string;
  line: number;
  /** The right-hand side as written. */
  from: number;
  to: number;
  /** Exponent key → the written summands that contribute to that term. */
  terms: ReadonlyMap<string, SourceSpan[]>;
}

export interface OdeParseResult {
  ode: PolynomialOde | null;
  /** The same ODE with exact rational coefficients; null when there are errors. */
  exact: ExactOde | null;
  /** One entry per equation, in the order of `variables`. */
  sources: EquationSource[];
  diagnostics: Diagnostic[];
}

const NAME = "[A-Za-z][A-Za-z0-9_]*";
const EQUATION = [new RegExp(`^(${NAME})\\s*['′]$`), new RegExp(`^d\\s*(${NAME})\\s*/\\s*dt$`)];
const INITIAL = new RegExp(`^(${NAME})\\s*\\(\\s*0\\s*\\)$`);
const PARAMETER = new RegExp(`^(${NAME})$`);

interface Statement {
  kind: "equation" | "initial" | "parameter";
  name: string;
  line: number;
  /** Span of the name on the left and of the expression on the right. */
  nameSpan: Span;
  rhs: Span;
}

export function parseOde(text: string): OdeParseResult {
  const diagnostics: Diagnostic[] = [];
  const lineStarts = [0];
  for (let i = 0; i < text.length; i++) if (text[i] === "\n") lineStarts.push(i + 1);
  const locate = (span: Span): SourceSpan => {
    let line = lineStarts.length - 1;
    while (lineStarts[line] > span.from) line--;
    return { ...span, line: line + 1, column: span.from - lineStarts[line] + 1 };
  };
  const report = (span: Span, message: string, severity: Diagnostic["severity"] = "error") => {
    const { line, column } = locate(span);
    diagnostics.push({ severity, line, column, message, from: span.from, to: span.to });
  };

  const statements = readStatements(text, lineStarts, report);
  const firstOf = new Map<string, Statement>();
  const unique = statements.filter((s) => {
    const key = `${s.kind}:${s.name}`;
    const first = firstOf.get(key);
    if (first) {
      const what = { equation: "equation for", initial: "initial value of", parameter: "value of" }[s.kind];
      report(s.nameSpan, `second ${what} ${s.name} (the first is on line ${first.line})`);
      return false;
    }
    firstOf.set(key, s);
    return true;
  });

  const equations = unique.filter((s) => s.kind === "equation");
  const variables = new Map(equations.map((s, i) => [s.name, i]));
  const withoutEquation = new Map(
    unique
      .filter((s) => s.kind === "initial" && !variables.has(s.name))
      .map((s) => [s.name, `${s.name} has an initial value but no equation`]),
  );
  const inValues = new Map([
    ...withoutEquation,
    ...[...variables.keys()].map((v): [string, string] => [v, `${v} is a variable; a value may use only numbers and parameters`]),
  ]);
  // Parameters first, in order: each may use the ones above it, equations may use any of them.
  const parameters = new Map<string, Q.Rational>();
  const constants: Scope = { variables: new Map(), parameters, unavailable: inValues };
  for (const s of unique.filter((u) => u.kind === "parameter")) {
    if (variables.has(s.name)) {
      report(s.nameSpan, `${s.name} has an equation and cannot also be a parameter`);
      continue;
    }
    const value = evaluate(text, s.rhs, constants, report);
    if (value) parameters.set(s.name, value);
  }

  const initial = equations.map(() => Q.ZERO);
  for (const s of unique.filter((u) => u.kind === "initial")) {
    const index = variables.get(s.name);
    if (index === undefined) {
      report(s.nameSpan, `initial value for ${s.name}, which has no equation ${s.name}' = …`);
      continue;
    }
    const value = evaluate(text, s.rhs, constants, report);
    if (value) initial[index] = value;
  }

  const fullScope: Scope = { variables, parameters, unavailable: withoutEquation };
  const sources: EquationSource[] = [];
  const rhs: Polynomial[] = [];
  for (const s of equations) {
    const terms = new Map<string, Span[]>();
    rhs.push(expandEquation(text, s.rhs, fullScope, terms, report) ?? P.zero());
    const located = new Map([...terms].map(([key, spans]) => [key, spans.map(locate)]));
    sources.push({ variable: s.name, line: s.line, from: s.rhs.from, to: s.rhs.to, terms: located });
  }
  if (equations.length === 0 && !diagnostics.some((d) => d.severity === "error")) {
    report({ from: 0, to: 0 }, "no equations: write one a line, as x' = 10*(y - x) or dx/dt = 10*(y - x)");
  }

  diagnostics.sort((a, b) => a.from - b.from);
  if (diagnostics.some((d) => d.severity === "error")) return { ode: null, exact: null, sources, diagnostics };
  const exact: ExactOde = { variables: [...variables.keys()], rhs, initial };
  return { ode: toPolynomialOde(exact), exact, sources, diagnostics };
}

type Report = (span: Span, message: string) => void;

function readStatements(text: string, lineStarts: number[], report: Report): Statement[] {
  const statements: Statement[] = [];
  lineStarts.forEach((start, index) => {
    const end = index + 1 < lineStarts.length ? lineStarts[index + 1] - 1 : text.length;
    const lineText = text.slice(start, end);
    const hash = lineText.indexOf("#");
    const content = hash >= 0 ? lineText.slice(0, hash) : lineText;
    if (content.trim() === "") return;
    const lead = start + (content.length - content.trimStart().length);
    const tail = start + content.trimEnd().length;
    const equals = content.indexOf("=");
    if (equals < 0 || content[equals + 1] === "=") {
      report({ from: lead, to: tail }, "expected x' = …, dx/dt = …, name = number or x(0) = number");
      return;
    }
    const left = content.slice(0, equals).trim();
    const leftFrom = start + content.indexOf(left);
    const rhsRaw = content.slice(equals + 1);
    const rhsFrom = start + equals + 1 + (rhsRaw.length - rhsRaw.trimStart().length);
    const rhs = { from: rhsFrom, to: Math.max(rhsFrom, start + equals + 1 + rhsRaw.trimEnd().length) };
    const nameSpan = { from: leftFrom, to: leftFrom + left.length };
    if (rhs.from === rhs.to) {
      report(nameSpan, `nothing after = for ${left}`);
      return;
    }
    const line = index + 1;
    const equation = EQUATION.map((r) => r.exec(left)).find(Boolean);
    const initial = INITIAL.exec(left);
    const parameter = PARAMETER.exec(left);
    if (equation) statements.push({ kind: "equation", name: equation[1], line, nameSpan, rhs });
    else if (initial) statements.push({ kind: "initial", name: initial[1], line, nameSpan, rhs });
    else if (parameter) statements.push({ kind: "parameter", name: parameter[1], line, nameSpan, rhs });
    else report(nameSpan, `cannot read "${left}": expected x', dx/dt, a name, or x(0) before =`);
  });
  return statements;
}

/** Parses with mathjs, reporting a syntax error at the character mathjs names. */
function parseSyntax(text: string, span: Span, report: Report): MathNode | null {
  try {
    return parseMath(text.slice(span.from, span.to));
  } catch (error) {
    const char = (error as { char?: number }).char;
    const at = typeof char === "number" ? Math.min(span.to, span.from + Math.max(0, char - 1)) : span.from;
    report({ from: at, to: Math.min(span.to, at + 1) || at }, `cannot read the expression: ${(error as Error).message}`);
    return null;
  }
}

/** Converts a written span, pointing an error at the offending word when there is one. */
function convert(text: string, span: Span, node: MathNode, scope: Scope, report: Report): Polynomial | null {
  try {
    return toPolynomial(node, scope);
  } catch (error) {
    if (!(error instanceof NotPolynomial)) throw error;
    report(locateWord(text, span, error) ?? span, error.message);
    return null;
  }
}

function locateWord(text: string, span: Span, error: NotPolynomial): Span | null {
  if (!error.word) return null;
  const pattern = new RegExp(`(?<![A-Za-z0-9_])${error.word}(?![A-Za-z0-9_])${error.call ? "(?=\\s*\\()" : ""}`);
  const match = pattern.exec(text.slice(span.from, span.to));
  return match ? { from: span.from + match.index, to: span.from + match.index + error.word.length } : null;
}

/** A parameter or initial value: an expression of numbers and parameters (no variables in scope). */
function evaluate(text: string, span: Span, scope: Scope, report: Report): Q.Rational | null {
  const node = parseSyntax(text, span, report);
  const value = node && convert(text, span, node, scope, report);
  return value && P.constantValue(value);
}

/**
 * Expands the right-hand side and records which written summand produced each term. The summands are
 * re-parsed one by one only for that record; if they do not add up to the whole (an unusual layout),
 * every term points at the whole right-hand side.
 */
function expandEquation(
  text: string,
  span: Span,
  scope: Scope,
  terms: Map<string, Span[]>,
  report: Report,
): Polynomial | null {
  const node = parseSyntax(text, span, report);
  const whole = node && convert(text, span, node, scope, report);
  if (!whole) return null;
  const pieces = splitSummands(text, span).map((piece) => {
    try {
      return { piece, polynomial: toPolynomial(parseMath(text.slice(piece.from, piece.to)), scope) };
    } catch {
      return null;
    }
  });
  const consistent =
    pieces.every(Boolean) && P.equals(pieces.reduce((sum, p) => P.add(sum, p!.polynomial), P.zero()), whole);
  for (const { piece, polynomial } of consistent ? pieces.map((p) => p!) : [{ piece: span, polynomial: whole }]) {
    for (const key of polynomial.keys()) terms.set(key, [...(terms.get(key) ?? []), piece]);
  }
  return whole;
}
