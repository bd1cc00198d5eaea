// Custom rate laws (`@ { Vmax*S/(Km + S) }`): read with mathjs and restricted to plain algebra, so
// that every consumer (analysis, ODE text, simulation) can rely on the same small vocabulary.
import { parse, type MathNode } from "mathjs";

/** Functions a rate law may call: the ordinary ones of rate expressions (Arrhenius, Hill, limits). */
export const lawFunctions: ReadonlySet<string> = new Set([
  "exp", "log", "log10", "sqrt", "cbrt", "abs", "pow", "min", "max",
  "sin", "cos", "tan", "sinh", "cosh", "tanh",
]);

/** Constants a law may use without declaring them, unless a species or parameter takes the name. */
export const lawConstants: ReadonlySet<string> = new Set(["pi", "e"]);

const operators = new Set(["+", "-", "*", "/", "^"]);

export type LawReading =
  | { ok: true; node: MathNode; symbols: string[] }
  | { ok: false; message: string; offset: number };

/** Parses a law and lists the names it uses; `offset` locates an error within the text. */
export function readLaw(text: string): LawReading {
  let node: MathNode;
  try {
    node = parse(text);
  } catch (error) {
    const raw = error instanceof Error ? error.message : String(error);
    const char = /\(char (\d+)\)/.exec(raw);
    const message = raw.replace(/\s*\(char \d+\)/, "");
    return { ok: false, message: `This rate law cannot be read: ${message}.`, offset: char ? Math.max(0, Number(char[1]) - 1) : 0 };
  }
  const symbols = new Set<string>();
  const unsupported = firstUnsupported(node, symbols);
  if (unsupported) return { ok: false, message: unsupported, offset: 0 };
  return { ok: true, node, symbols: [...symbols] };
}

function firstUnsupported(node: MathNode, symbols: Set<string>): string | null {
  const plain =
    "A rate law is built from species, parameters, numbers, + - * / ^, parentheses and functions such as exp or log";
  switch (node.type) {
    case "ConstantNode":
      return typeof (node as unknown as { value: unknown }).value === "number" ? null : `${plain}.`;
    case "SymbolNode":
      symbols.add((node as unknown as { name: string }).name);
      return null;
    case "ParenthesisNode":
      return firstUnsupported((node as unknown as { content: MathNode }).content, symbols);
    case "OperatorNode": {
      const { op, args } = node as unknown as { op: string; args: MathNode[] };
      if (!operators.has(op)) return `${plain}; "${op}" is not one of them.`;
      return firstOf(args, symbols);
    }
    case "FunctionNode": {
      const { fn, args } = node as unknown as { fn: MathNode; args: MathNode[] };
      const name = fn.type === "SymbolNode" ? (fn as unknown as { name: string }).name : "";
      if (!lawFunctions.has(name)) {
        return `${name || "This"}() is not a function a rate law may use; use one of ${[...lawFunctions].join(", ")}.`;
      }
      return firstOf(args, symbols);
    }
    default:
      return `${plain}.`;
  }
}

function firstOf(nodes: MathNode[], symbols: Set<string>): string | null {
  for (const child of nodes) {
    const problem = firstUnsupported(child, symbols);
    if (problem) return problem;
  }
  return null;
}
