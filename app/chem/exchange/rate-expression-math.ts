// Arithmetic rate coefficients as mathjs trees, the form the MathML writer and reader work on.
import { parse, type MathNode } from "mathjs";
import type { RateExpression } from "~/chem/model";
import { isRateFunction, rateExpressionText } from "~/chem/rate-expression";

/** The expression as a mathjs tree; its text is mathjs syntax by design. */
export function rateExpressionNode(tree: RateExpression): MathNode {
  return parse(rateExpressionText(tree));
}

const binary: Record<string, Extract<RateExpression, { kind: "binary" }>["operator"]> = { add: "+", subtract: "-", multiply: "*", divide: "/", pow: "^" };

/**
 * A mathjs tree as a rate expression over the names `nameOf` gives; null when it holds anything
 * but numbers, those names, + - * / ^, exp, ln and sqrt (or a name `nameOf` does not know).
 */
export function rateExpressionOf(node: MathNode, nameOf: (id: string) => string | null): RateExpression | null {
  const n = node as MathNode & { value?: unknown; name?: string; content?: MathNode; fn?: unknown; args?: MathNode[] };
  switch (node.type) {
    case "ConstantNode":
      return typeof n.value === "number" && Number.isFinite(n.value) ? { kind: "number", value: n.value } : null;
    case "SymbolNode": {
      const name = nameOf(n.name!);
      return name === null ? null : { kind: "parameter", name };
    }
    case "ParenthesisNode":
      return rateExpressionOf(n.content!, nameOf);
    case "OperatorNode": {
      const args = n.args!.map((arg) => rateExpressionOf(arg, nameOf));
      if (args.some((arg) => arg === null)) return null;
      if (n.fn === "unaryMinus" && args.length === 1) return { kind: "negate", operand: args[0]! };
      if (n.fn === "unaryPlus" && args.length === 1) return args[0];
      const operator = binary[n.fn as string];
      return operator && args.length === 2 ? { kind: "binary", operator, left: args[0]!, right: args[1]! } : null;
    }
    case "FunctionNode": {
      const fn = (n.fn as { name?: string }).name ?? "";
      if (!isRateFunction(fn) || n.args!.length !== 1) return null;
      const argument = rateExpressionOf(n.args![0], nameOf);
      return argument && { kind: "call", name: fn, argument };
    }
  }
  return null;
}
