// Turns one mathjs expression tree into an exact polynomial, or says why it is not one.
import type { MathNode } from "mathjs";
import { lawFunctions } from "../law";
import * as P from "./polynomial";
import type { Polynomial } from "./polynomial";
import * as Q from "../linalg/rational";

export interface Scope {
  variables: ReadonlyMap<string, number>;
  parameters: ReadonlyMap<string, Q.Rational>;
  /** Known names that may not be used here, with the reason (a variable in a value, say). */
  unavailable: ReadonlyMap<string, string>;
}

/** Why an expression is not a polynomial; `word` (a name, `call` if a function) lets the caller point at it. */
export class NotPolynomial extends Error {
  constructor(
    message: string,
    readonly word: string | null = null,
    readonly call = false,
  ) {
    super(message);
  }
}

/** Expansion limits, so that one pasted `(x + y + z)^500` cannot stall the server. */
const MAX_TERMS = 10_000;
const MAX_POWER = 1_000;

/** The named mathematical constants, when no variable or parameter takes the name. */
const CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E };

export function toPolynomial(node: MathNode, scope: Scope): Polynomial {
  const result = expand(node, scope);
  if (result.size > MAX_TERMS) throw new NotPolynomial(`${node.toString()} expands to more than ${MAX_TERMS.toLocaleString("en")} terms`);
  return result;
}

function expand(node: MathNode, scope: Scope): Polynomial {
  const n = scope.variables.size;
  const recurse = (child: MathNode) => toPolynomial(child, scope);

  switch (node.type) {
    case "ConstantNode": {
      const value = (node as unknown as { value: unknown }).value;
      if (typeof value !== "number" || !Number.isFinite(value)) throw new NotPolynomial(`${node.toString()} is not a finite number`);
      return P.constant(n, Q.fromNumber(value));
    }
    case "SymbolNode": {
      const name = (node as unknown as { name: string }).name;
      const index = scope.variables.get(name);
      if (index !== undefined) return P.variable(n, index);
      const value = scope.parameters.get(name);
      if (value) return P.constant(n, value);
      if (Object.hasOwn(CONSTANTS, name)) return P.constant(n, Q.fromNumber(CONSTANTS[name]));
      if (name === "t") throw new NotPolynomial("time t may not appear: the ODE must be autonomous", name);
      const reason = scope.unavailable.get(name);
      if (reason) throw new NotPolynomial(reason, name);
      throw new NotPolynomial(`unknown name ${name}: give it an equation ${name}' = … or a value ${name} = …`, name);
    }
    case "ParenthesisNode":
      return recurse((node as unknown as { content: MathNode }).content);
    case "OperatorNode": {
      const { op, args } = node as unknown as { op: string; args: MathNode[] };
      if (args.length === 1 && (op === "-" || op === "+")) {
        const inner = recurse(args[0]);
        return op === "-" ? P.scale(inner, Q.neg(Q.ONE)) : inner;
      }
      if (args.length !== 2) throw new NotPolynomial(`the operator ${op} is not allowed`);
      const [left, right] = args.map(recurse);
      switch (op) {
        case "+":
          return P.add(left, right);
        case "-":
          return P.sub(left, right);
        case "*":
          return P.mul(left, right);
        case "/": {
          const divisor = P.constantValue(right);
          if (!divisor) throw new NotPolynomial(`division by an expression in the variables (${args[1].toString()}) is not polynomial`);
          if (Q.isZero(divisor)) throw new NotPolynomial("division by zero");
          return P.scale(left, Q.div(Q.ONE, divisor));
        }
        case "^":
          return power(node, left, right, args, n);
        default:
          throw new NotPolynomial(`the operator ${op} is not allowed`);
      }
    }
    case "FunctionNode": {
      const { fn, args } = node as unknown as { fn: { name?: string }; args: MathNode[] };
      const name = fn.name ?? node.toString();
      // The same small vocabulary as custom rate laws; never mathjs's own import, evaluate and such.
      if (!lawFunctions.has(name)) throw new NotPolynomial(`unknown function ${name}; of numbers, ${[...lawFunctions].join(", ")} may be used`, name, true);
      if (args.some((arg) => !P.constantValue(recurse(arg)))) {
        throw new NotPolynomial(`${name}(…) of a variable is not polynomial`, name, true);
      }
      // A function of numbers (sqrt(2), exp(1)) is a number; it is taken as the decimal it prints as.
      let value: unknown;
      try {
        value = node.evaluate(Object.fromEntries([...scope.parameters].map(([k, v]) => [k, Q.toNumber(v)])));
      } catch (error) {
        throw new NotPolynomial(`${node.toString()}: ${(error as Error).message}`, name, true);
      }
      if (typeof value !== "number" || !Number.isFinite(value)) throw new NotPolynomial(`${node.toString()} is not a finite number`, name, true);
      return P.constant(n, Q.fromNumber(value));
    }
    default:
      throw new NotPolynomial(`${node.toString()} is not allowed in a polynomial`);
  }
}

function power(node: MathNode, base: Polynomial, exponent: Polynomial, args: MathNode[], n: number): Polynomial {
  const e = P.constantValue(exponent);
  if (!e) throw new NotPolynomial(`a power with a variable exponent (${args[1].toString()}) is not polynomial`);
  const baseValue = P.constantValue(base);
  if (e.den === 1n && (e.num > BigInt(MAX_POWER) || e.num < -BigInt(MAX_POWER))) {
    throw new NotPolynomial(`the power ${e.num} is beyond the limit of ±${MAX_POWER}`);
  }
  if (e.den === 1n && e.num >= 0n) {
    if (termBound(base.size, Number(e.num)) > MAX_TERMS) {
      throw new NotPolynomial(`${node.toString()} expands to more than ${MAX_TERMS.toLocaleString("en")} terms`);
    }
    return P.power(base, Number(e.num), n);
  }
  if (baseValue && !Q.isZero(baseValue)) {
    if (e.den === 1n) return P.constant(n, Q.pow(baseValue, Number(e.num)));
    const value = Q.toNumber(baseValue) ** Q.toNumber(e);
    if (!Number.isFinite(value)) throw new NotPolynomial(`${node.toString()} is not a finite real number`);
    return P.constant(n, Q.fromNumber(value));
  }
  throw new NotPolynomial(
    `${node.toString()}: a variable may only be raised to a non-negative integer power, not ${Q.toText(e)}`,
  );
}

/** At most C(e + k − 1, k − 1) terms in the e-th power of a k-term polynomial, computed with an early exit. */
function termBound(k: number, e: number): number {
  let bound = 1;
  for (let i = 1; i < k && bound <= MAX_TERMS; i++) bound = (bound * (e + i)) / i;
  return bound;
}
