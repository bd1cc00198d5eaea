// Content MathML (the SBML kinetic-law notation) to and from mathjs expression trees, limited to
// the vocabulary a `.weave` rate law accepts (law.ts): + - * / ^, numbers, names and the listed
// functions. Anything else in a file is reported, never silently dropped.
import {
  ConstantNode,
  FunctionNode,
  OperatorNode,
  SymbolNode,
  isConstantNode,
  isFunctionNode,
  isOperatorNode,
  isParenthesisNode,
  isSymbolNode,
  type MathNode,
} from "mathjs";
import { lawFunctions } from "~/chem/law";
import type { XmlElement, XmlOut } from "./xml";

const mathmlNamespace = "http://www.w3.org/1998/Math/MathML";

// ---- mathjs → MathML

/**
 * A `<math>` element for an expression. `idOf` maps each name in the expression to the SId it is
 * written as, or null for names that are not model quantities (the constants pi and e).
 */
export function mathmlOf(node: MathNode, idOf: (name: string) => string | null): XmlOut {
  return { name: "math", attributes: { xmlns: mathmlNamespace }, children: [contentOf(node, idOf)] };
}

const operatorElements: Record<string, string> = { "+": "plus", "-": "minus", "*": "times", "/": "divide", "^": "power" };

/** Functions written as a MathML element of the same name, taking the same arguments. */
const sameNameFunctions = new Set(["exp", "abs", "min", "max", "sin", "cos", "tan", "sinh", "cosh", "tanh"]);

function contentOf(node: MathNode, idOf: (name: string) => string | null): XmlOut {
  const of = (each: MathNode) => contentOf(each, idOf);
  if (isParenthesisNode(node)) return of(node.content);
  if (isConstantNode(node)) return numberElement(Number(node.value));
  if (isSymbolNode(node)) {
    const id = idOf(node.name);
    if (id !== null) return { name: "ci", children: [id] };
    if (node.name === "pi") return { name: "pi" };
    if (node.name === "e") return { name: "exponentiale" };
    throw new Error(`No SBML identifier for ${node.name}.`);
  }
  if (isOperatorNode(node)) {
    if (node.fn === "unaryPlus") return of(node.args[0]);
    if (node.fn === "unaryMinus") return apply("minus", [of(node.args[0])]);
    const element = operatorElements[node.op];
    if (!element) throw new Error(`The operator ${node.op} has no MathML form here.`);
    // mathjs nests a*b*c as (a*b)*c; MathML's plus and times take any number of arguments.
    const flattened = element === "plus" || element === "times" ? flatten(node, node.op) : node.args;
    return apply(element, flattened.map(of));
  }
  if (isFunctionNode(node)) {
    const name = node.fn.name;
    const args = node.args.map(of);
    if (sameNameFunctions.has(name)) return apply(name, args);
    switch (name) {
      case "log":
        return args.length === 1 ? apply("ln", args) : apply("log", [qualifier("logbase", args[1]), args[0]]);
      case "log10":
        return apply("log", args);
      case "sqrt":
        return apply("root", args);
      case "cbrt":
        return apply("root", [qualifier("degree", numberElement(3)), ...args]);
      case "pow":
        return apply("power", args);
    }
    throw new Error(`The function ${name} has no MathML form here.`);
  }
  throw new Error(`A ${node.type} has no MathML form here.`);
}

function flatten(node: MathNode, op: string): MathNode[] {
  const inner = isParenthesisNode(node) ? node.content : node;
  if (isOperatorNode(inner) && inner.op === op && inner.args.length === 2) return inner.args.flatMap((arg) => flatten(arg, op));
  return [node];
}

function apply(operator: string, args: XmlOut[]): XmlOut {
  return { name: "apply", children: [{ name: operator }, ...args] };
}

function qualifier(name: string, content: XmlOut): XmlOut {
  return { name, children: [content] };
}

function numberElement(value: number): XmlOut {
  // libSBML reads an integer <cn> into a 32-bit int: larger whole numbers (1.2e11) go as reals.
  if (Number.isInteger(value) && Math.abs(value) < 2 ** 31 && !String(value).includes("e")) {
    return { name: "cn", attributes: { type: "integer" }, children: [String(value)] };
  }
  const [mantissa, exponent] = String(value).split("e");
  if (exponent === undefined) return { name: "cn", children: [mantissa] };
  return { name: "cn", attributes: { type: "e-notation" }, children: [mantissa, { name: "sep" }, exponent] };
}

// ---- MathML → mathjs

/** A user-defined function from an SBML `functionDefinition`: parameter names and body. */
export interface Lambda {
  parameters: string[];
  body: XmlElement;
}

export type MathReading = { ok: true; node: MathNode } | { ok: false; message: string };

/** Reads the expression inside a `<math>` element; names stay the file's SIds. */
export function readMathml(math: XmlElement, functions: ReadonlyMap<string, Lambda>): MathReading {
  if (math.name !== "math" || math.namespace !== mathmlNamespace) {
    return { ok: false, message: `expected a <math> element in the MathML namespace ${mathmlNamespace}` };
  }
  if (math.children.length !== 1) return { ok: false, message: "a <math> element must hold exactly one expression" };
  try {
    return { ok: true, node: new MathmlReader(functions).expression(math.children[0]) };
  } catch (error) {
    if (error instanceof UnreadableMath) return { ok: false, message: error.message };
    throw error;
  }
}

class UnreadableMath extends Error {}

const unaryFunctions: Record<string, string> = {
  exp: "exp", ln: "log", abs: "abs", sin: "sin", cos: "cos", tan: "tan", sinh: "sinh", cosh: "cosh", tanh: "tanh",
};

class MathmlReader {
  /** Function definitions being expanded, to refuse one that calls itself. */
  private readonly expanding = new Set<string>();

  constructor(private readonly functions: ReadonlyMap<string, Lambda>) {}

  expression(element: XmlElement): MathNode {
    switch (element.name) {
      case "cn":
        return this.number(element);
      case "ci":
        if (!element.text) throw new UnreadableMath("a <ci> element is empty");
        return new SymbolNode(element.text);
      // Constants are written as their values: a file may also use "pi" or "e" as an SId.
      case "pi":
        return new ConstantNode(Math.PI);
      case "exponentiale":
        return new ConstantNode(Math.E);
      case "semantics":
        if (element.children.length === 0) throw new UnreadableMath("a <semantics> element is empty");
        return this.expression(element.children[0]);
      case "apply":
        return this.application(element);
    }
    throw new UnreadableMath(`<${element.name}> is not something a Mechweave rate law can express`);
  }

  private number(element: XmlElement): MathNode {
    const type = element.attributes.type ?? "real";
    if ((element.attributes.base ?? "10") !== "10") throw new UnreadableMath(`the number <cn base="${element.attributes.base}"> is not in base 10`);
    const parts = element.texts.map(Number);
    let value: number;
    if ((type === "real" || type === "integer") && parts.length === 1) value = parts[0];
    else if (type === "e-notation" && parts.length === 2) value = parts[0] * 10 ** parts[1];
    else if (type === "rational" && parts.length === 2) value = parts[0] / parts[1];
    else throw new UnreadableMath(`the number <cn type="${type}">${element.texts.join(" ")}</cn> cannot be read`);
    if (!Number.isFinite(value) || element.texts.some((text) => text.trim() === "")) {
      throw new UnreadableMath(`the number <cn>${element.texts.join(" ")}</cn> is not a finite number`);
    }
    const magnitude = new ConstantNode(Math.abs(value));
    return value < 0 ? new OperatorNode("-", "unaryMinus", [magnitude]) : magnitude;
  }

  private application(element: XmlElement): MathNode {
    const [head, ...rest] = element.children;
    if (!head) throw new UnreadableMath("an <apply> element is empty");
    const qualifiers = new Map(rest.filter((each) => each.name === "degree" || each.name === "logbase").map((each) => [each.name, each]));
    const args = rest.filter((each) => !qualifiers.has(each.name)).map((each) => this.expression(each));
    const arity = (allowed: number[]) => {
      if (!allowed.includes(args.length)) {
        throw new UnreadableMath(`<${head.name}> takes ${allowed.join(" or ")} argument${allowed.at(-1) === 1 ? "" : "s"}, not ${args.length}`);
      }
    };
    switch (head.name) {
      case "plus":
        return args.length === 0 ? new ConstantNode(0) : args.reduce((sum, arg) => new OperatorNode("+", "add", [sum, arg]));
      case "times":
        return args.length === 0 ? new ConstantNode(1) : args.reduce((product, arg) => new OperatorNode("*", "multiply", [product, arg]));
      case "minus":
        arity([1, 2]);
        return args.length === 1
          ? new OperatorNode("-", "unaryMinus", [args[0]])
          : new OperatorNode("-", "subtract", [args[0], args[1]]);
      case "divide":
        arity([2]);
        return new OperatorNode("/", "divide", [args[0], args[1]]);
      case "power":
        arity([2]);
        return new OperatorNode("^", "pow", [args[0], args[1]]);
      case "root":
        arity([1]);
        return this.root(args[0], qualifiers.get("degree"));
      case "log":
        arity([1]);
        return this.logarithm(args[0], qualifiers.get("logbase"));
      case "min":
      case "max":
        if (args.length === 0) throw new UnreadableMath(`<${head.name}> needs at least one argument`);
        return call(head.name, args);
      case "ci":
        return this.userFunction(head.text, args);
    }
    const fn = unaryFunctions[head.name];
    if (!fn) throw new UnreadableMath(`<${head.name}> is not something a Mechweave rate law can express`);
    arity([1]);
    return call(fn, args);
  }

  private root(radicand: MathNode, degree: XmlElement | undefined): MathNode {
    const n = degree ? this.qualifierValue(degree) : new ConstantNode(2);
    if (isConstantNode(n) && n.value === 2) return call("sqrt", [radicand]);
    if (isConstantNode(n) && n.value === 3) return call("cbrt", [radicand]);
    return new OperatorNode("^", "pow", [radicand, new OperatorNode("/", "divide", [new ConstantNode(1), n])]);
  }

  private logarithm(argument: MathNode, base: XmlElement | undefined): MathNode {
    const b = base ? this.qualifierValue(base) : new ConstantNode(10);
    if (isConstantNode(b) && b.value === 10) return call("log10", [argument]);
    return call("log", [argument, b]);
  }

  private qualifierValue(qualifier: XmlElement): MathNode {
    if (qualifier.children.length !== 1) throw new UnreadableMath(`<${qualifier.name}> must hold one expression`);
    return this.expression(qualifier.children[0]);
  }

  /** Expands a call of an SBML function definition by substituting its arguments into the body. */
  private userFunction(name: string, args: MathNode[]): MathNode {
    const lambda = this.functions.get(name);
    if (!lambda) throw new UnreadableMath(`${name} is applied as a function, but no function definition has that id`);
    if (lambda.parameters.length !== args.length) {
      throw new UnreadableMath(`the function ${name} takes ${lambda.parameters.length} arguments, not ${args.length}`);
    }
    if (this.expanding.has(name)) throw new UnreadableMath(`the function ${name} calls itself`);
    this.expanding.add(name);
    const body = this.expression(lambda.body);
    this.expanding.delete(name);
    const bound = new Map(lambda.parameters.map((parameter, index) => [parameter, args[index]]));
    return body.transform((node, path) => (isSymbolNode(node) && path !== "fn" && bound.has(node.name) ? bound.get(node.name)! : node));
  }
}

function call(name: string, args: MathNode[]): MathNode {
  if (!lawFunctions.has(name)) throw new Error(`${name} is not a rate-law function.`);
  return new FunctionNode(new SymbolNode(name), args);
}
