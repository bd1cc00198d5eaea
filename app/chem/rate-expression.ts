// Rate coefficients written as arithmetic (`2.0e6 * T^0.5 * exp(-6000 / T)`): their value at given
// parameters, the parameters they use, and their text. The text is also mathjs syntax, because a
// coefficient merged into a custom law is read back by the law compiler.
import type { RateExpression, RateFunction } from "./model";

export const RATE_FUNCTIONS: readonly RateFunction[] = ["exp", "log", "sqrt"];

export function isRateFunction(name: string): name is RateFunction {
  return (RATE_FUNCTIONS as readonly string[]).includes(name);
}

/**
 * The value, or why there is none. `problem` is null when a parameter has no value (the parser
 * reports that once, on the parameter), else a sentence naming what went wrong.
 */
export type Evaluation = { ok: true; value: number } | { ok: false; problem: string | null };

class NoValue extends Error {
  constructor(readonly problem: string | null) {
    super(problem ?? "a parameter has no value");
  }
}

export function evaluateRateExpression(tree: RateExpression, parameters: Record<string, number>): Evaluation {
  try {
    return { ok: true, value: valueOf(tree, parameters) };
  } catch (error) {
    if (error instanceof NoValue) return { ok: false, problem: error.problem };
    throw error;
  }
}

function valueOf(node: RateExpression, parameters: Record<string, number>): number {
  switch (node.kind) {
    case "number":
      return node.value;
    case "parameter": {
      const value = parameters[node.name];
      if (value === undefined) throw new NoValue(null);
      return value;
    }
    case "negate":
      return -valueOf(node.operand, parameters);
    case "call":
      return called(node.name, valueOf(node.argument, parameters), node);
    case "binary":
      return combined(node, valueOf(node.left, parameters), valueOf(node.right, parameters));
  }
}

function called(name: RateFunction, x: number, node: RateExpression): number {
  if (name === "log" && x <= 0) throw new NoValue(`log of ${formatValue(x)} is not defined: in ${rateExpressionText(node)} the argument must be positive.`);
  if (name === "sqrt" && x < 0) throw new NoValue(`sqrt of ${formatValue(x)} is not defined: in ${rateExpressionText(node)} the argument must not be negative.`);
  const value = name === "exp" ? Math.exp(x) : name === "log" ? Math.log(x) : Math.sqrt(x);
  return finite(value, node);
}

function combined(node: Extract<RateExpression, { kind: "binary" }>, a: number, b: number): number {
  switch (node.operator) {
    case "+":
      return finite(a + b, node);
    case "-":
      return finite(a - b, node);
    case "*":
      return finite(a * b, node);
    case "/":
      if (b === 0) throw new NoValue(`Division by zero in ${rateExpressionText(node)}.`);
      return finite(a / b, node);
    case "^": {
      const value = Math.pow(a, b);
      if (Number.isNaN(value)) throw new NoValue(`${rateExpressionText(node)} is not a real number (${formatValue(a)} to the power ${formatValue(b)}).`);
      return finite(value, node);
    }
  }
}

function finite(value: number, node: RateExpression): number {
  if (!Number.isFinite(value)) throw new NoValue(`${rateExpressionText(node)} is too large to compute.`);
  return value;
}

function formatValue(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/** Every parameter the expression uses, each once, in order of appearance. */
export function rateExpressionParameters(tree: RateExpression): string[] {
  const names = new Set<string>();
  const visit = (node: RateExpression): void => {
    if (node.kind === "parameter") names.add(node.name);
    else if (node.kind === "negate") visit(node.operand);
    else if (node.kind === "call") visit(node.argument);
    else if (node.kind === "binary") {
      visit(node.left);
      visit(node.right);
    }
  };
  visit(tree);
  return [...names];
}

// ---- text

/** Binding strength: what must be parenthesised inside what. */
export function rateExpressionPrecedence(node: RateExpression): number {
  if (node.kind === "binary") return node.operator === "+" || node.operator === "-" ? 1 : node.operator === "^" ? 4 : 2;
  return node.kind === "negate" ? 3 : 5;
}

/**
 * Whether a child needs parentheses under a binary operator. The tree's shape is kept exactly: an
 * operand of equal strength on the right (`a - (b - c)`, `a / (b * c)`) and on the left of `^`
 * is parenthesised, and so is a negation anywhere but first.
 */
export function operandNeedsParentheses(parent: Extract<RateExpression, { kind: "binary" }>, side: "left" | "right"): boolean {
  const child = parent[side];
  const own = rateExpressionPrecedence(parent);
  const inner = rateExpressionPrecedence(child);
  if (child.kind === "negate") return side === "right" || parent.operator === "^";
  if (inner !== own) return inner < own;
  return parent.operator === "^" ? side === "left" : side === "right";
}

/** Canonical text, e.g. "2000000*T^0.5*exp(-6000/T)". */
export function rateExpressionText(node: RateExpression): string {
  switch (node.kind) {
    case "number":
      return String(node.value);
    case "parameter":
      return node.name;
    case "negate": {
      const operand = rateExpressionText(node.operand);
      return rateExpressionPrecedence(node.operand) < 3 ? `-(${operand})` : `-${operand}`;
    }
    case "call":
      return `${node.name}(${rateExpressionText(node.argument)})`;
    case "binary": {
      const side = (which: "left" | "right") => {
        const text = rateExpressionText(node[which]);
        return operandNeedsParentheses(node, which) ? `(${text})` : text;
      };
      const operator = node.operator === "+" || node.operator === "-" ? ` ${node.operator} ` : node.operator;
      return `${side("left")}${operator}${side("right")}`;
    }
  }
}
