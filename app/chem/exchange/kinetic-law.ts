// What an SBML kinetic law means for Mechweave: evaluated with mathjs at positive concentrations,
// and recognised as mass action — a coefficient times the reactant species to their stoichiometric
// powers, minus the same for the products when reversible — or else kept as a custom law.
// Mechweave models one well-mixed volume, so every compartment size is read as 1.
import {
  ConstantNode,
  OperatorNode,
  isConstantNode,
  isFunctionNode,
  isOperatorNode,
  isParenthesisNode,
  isSymbolNode,
  type EvalFunction,
  type MathNode,
} from "mathjs";
import type { SbmlModel, SbmlReaction, SbmlSpeciesReference } from "./sbml-document";
import { seededRandom } from "~/chem/seeded-random";

/** A rate coefficient as the file gives it: a model parameter, or a number (literals and local parameters). */
export type SbmlCoefficient = { kind: "parameter"; id: string } | { kind: "value"; value: number };

export type KineticLawReading =
  | {
      kind: "mass-action";
      forward: SbmlCoefficient;
      /** Null when the law has no backward term. */
      backward: SbmlCoefficient | null;
      /** Whether a coefficient combined several model parameters and is given as its value. */
      folded: boolean;
    }
  | { kind: "custom"; reason: string }
  | { kind: "unevaluable"; reason: string };

type Scope = Map<string, number>;

/** How many positive concentration vectors a law is compared at; drawn from a fixed seed for reproducible verdicts. */
const samplePoints = 4;

type QuantityKind = "species" | "compartment" | "parameter";

const notFinite = "it is not a finite real number at every positive concentration";

/** Reads the kinetic laws of one model; the model-wide names are looked up once, not per law. */
export class KineticLawReader {
  private readonly kinds = new Map<string, QuantityKind>();
  /** Values of the model-wide constants: compartments (read as 1) and parameters that have one. */
  private readonly values: Scope = new Map();

  constructor(model: SbmlModel) {
    for (const { id } of model.species) this.kinds.set(id, "species");
    for (const { id } of model.compartments) {
      this.kinds.set(id, "compartment");
      this.values.set(id, 1);
    }
    for (const { id, value } of model.parameters) {
      this.kinds.set(id, "parameter");
      if (value !== null) this.values.set(id, value);
    }
  }

  read(reaction: SbmlReaction): KineticLawReading {
    const law = reaction.law;
    if (!law?.math) return { kind: "unevaluable", reason: "it has no math" };
    const evaluation = this.evaluation(reaction);
    const unknown = evaluation.unknownNames();
    if (unknown) return { kind: "unevaluable", reason: unknown };
    // A mass-action rate is finite everywhere; a custom law may be undefined somewhere and still be the author's law.
    if (!evaluation.finite()) return { kind: "custom", reason: notFinite };

    const shape = massActionShape(withoutCompartmentFactors(law.math, (name) => evaluation.kindOf(name) === "compartment"));
    if (!shape) return { kind: "custom", reason: "it is not a product of a rate coefficient and species concentrations" };
    const forward = evaluation.coefficient(shape.forward, reaction.reactants);
    const backward = shape.backward ? evaluation.coefficient(shape.backward, reaction.products) : null;
    if (!forward || (shape.backward && !backward)) {
      return { kind: "custom", reason: "its species and powers differ from the reaction's stoichiometry" };
    }
    if (!evaluation.agrees(forward.value, backward?.value ?? 0)) return { kind: "custom", reason: "it does not evaluate to a mass-action rate" };
    return { kind: "mass-action", forward: forward.coefficient, backward: backward?.coefficient ?? null, folded: forward.folded || !!backward?.folded };
  }

  /**
   * For a law declared as mass action: null when it evaluates to kf·x^reactants (− kb·x^products
   * for a reversible reaction) for some kf, kb ≥ 0, whatever way it is written; else the reason.
   */
  massActionMismatch(reaction: SbmlReaction): string | null {
    if (!reaction.law?.math) return null;
    const evaluation = this.evaluation(reaction);
    const unknown = evaluation.unknownNames();
    if (unknown) return unknown;
    if (!evaluation.finite()) return notFinite;
    const fitted = evaluation.fit();
    if (!fitted) return "its value is not proportional to the mass-action rate of the reaction's stoichiometry";
    const [kf, kb] = fitted;
    if (evaluation.negative(kf, kb)) return `its fitted rate coefficients are negative (${kf}, ${kb})`;
    return evaluation.agrees(kf, kb) ? null : "it does not evaluate to the mass-action rate of the reaction's stoichiometry";
  }

  private evaluation(reaction: SbmlReaction): LawEvaluation {
    return new LawEvaluation(reaction, (id) => this.kinds.get(id), (id) => this.values.get(id));
  }
}

/** One law with the model's values, evaluated at a few positive concentration vectors. */
class LawEvaluation {
  private readonly points: Scope[] = [];
  private readonly locals: ReadonlyMap<string, number | null>;
  private readonly compiled: EvalFunction;
  /** Names the law uses that have no value (parameters without one, reaction ids, …). */
  private readonly missing: string[] = [];

  constructor(
    private readonly reaction: SbmlReaction,
    private readonly modelKind: (id: string) => QuantityKind | undefined,
    modelValue: (id: string) => number | undefined,
  ) {
    const law = reaction.law!;
    this.locals = law.localParameters;
    this.compiled = law.math!.compile();
    const constants: Scope = new Map();
    const species = new Set([...reaction.reactants, ...reaction.products].map((each) => each.species));
    law.math!.traverse((node, path) => {
      if (!isSymbolNode(node) || path === "fn" || constants.has(node.name)) return;
      if (this.kindOf(node.name) === "species") {
        species.add(node.name);
        return;
      }
      const value = this.locals.has(node.name) ? this.locals.get(node.name) : modelValue(node.name);
      if (value === null || value === undefined) this.missing.push(node.name);
      else constants.set(node.name, value);
    });
    const random = seededRandom(0x5eed);
    for (let point = 0; point < samplePoints; point++) {
      const scope: Scope = new Map();
      for (const id of species) scope.set(id, 0.5 + 1.5 * random());
      // Within its law a local parameter wins, even over a species of the same id.
      for (const [id, value] of constants) scope.set(id, value);
      this.points.push(scope);
    }
  }

  /** What a name means inside this law: a local parameter shadows any model-wide quantity. */
  kindOf(name: string): QuantityKind | "local" | undefined {
    return this.locals.has(name) ? "local" : this.modelKind(name);
  }

  /** Why the law cannot be evaluated at all — names without values — or null. */
  unknownNames(): string | null {
    if (this.missing.length === 0) return null;
    const what = [...new Set(this.missing)].map((name) => (this.locals.has(name) ? `the local parameter ${name}` : name)).join(", ");
    return `it uses ${what} without a value Mechweave can read (a parameter without a value, or a reaction or species-reference id)`;
  }

  /** Whether the law is a finite real number at every sample point. */
  finite(): boolean {
    return this.points.every((point) => this.evaluate(point) !== null);
  }

  /** The rate coefficient of one product-shaped term, when its species powers are the stoichiometry. */
  coefficient(term: ProductShape, references: SbmlSpeciesReference[]): { coefficient: SbmlCoefficient; value: number; folded: boolean } | null {
    const expected = stoichiometryOf(references);
    const parameters: [string, number][] = [];
    let value = term.constant;
    let literal = term.constant !== 1;
    for (const [name, power] of term.symbols) {
      const kind = this.kindOf(name);
      if (kind === "species") {
        if (expected.get(name) !== power) return null;
        expected.delete(name);
        continue;
      }
      value *= this.points[0].get(name)! ** power;
      if (kind === "parameter") parameters.push([name, power]);
      else if (kind === "local") literal = true;
    }
    if (expected.size > 0 || value < 0) return null;
    if (parameters.length === 1 && parameters[0][1] === 1 && !literal) {
      return { coefficient: { kind: "parameter", id: parameters[0][0] }, value, folded: false };
    }
    return { coefficient: { kind: "value", value }, value, folded: parameters.length > 0 };
  }

  /** kf (and kb for a reversible reaction) solved from the first sample points. */
  fit(): [number, number] | null {
    const [first, second] = this.points;
    const f1 = this.evaluate(first)!;
    const a = this.forward(first);
    if (!this.reaction.reversible) return [f1 / a, 0];
    const f2 = this.evaluate(second)!;
    const [b, c, d] = [-this.backward(first), this.forward(second), -this.backward(second)];
    const determinant = a * d - b * c;
    if (Math.abs(determinant) <= 1e-12 * Math.abs(a * d)) return null;
    return [(f1 * d - b * f2) / determinant, (a * f2 - c * f1) / determinant];
  }

  /** Whether a fitted coefficient is negative beyond rounding, measured against the size of the rate. */
  negative(kf: number, kb: number): boolean {
    const [forward, backward] = [kf * this.forward(this.points[0]), kb * this.backward(this.points[0])];
    const rounding = 1e-9 * (Math.abs(forward) + Math.abs(backward));
    return forward < -rounding || backward < -rounding;
  }

  /** Whether the law equals kf·x^reactants − kb·x^products at every sample point. */
  agrees(kf: number, kb: number): boolean {
    return this.points.every((point) => {
      const forward = kf * this.forward(point);
      const backward = kb * this.backward(point);
      return Math.abs(this.evaluate(point)! - (forward - backward)) <= 1e-9 * (Math.abs(forward) + Math.abs(backward)) + 1e-300;
    });
  }

  private forward(point: Scope): number {
    return monomial(point, this.reaction.reactants);
  }

  private backward(point: Scope): number {
    return monomial(point, this.reaction.products);
  }

  private evaluate(point: Scope): number | null {
    let value: unknown;
    try {
      value = this.compiled.evaluate(point);
    } catch {
      return null;
    }
    return typeof value === "number" && Number.isFinite(value) ? value : null;
  }
}

/** A product of a number and names to integer powers, e.g. 2·k·A·B². */
interface ProductShape {
  constant: number;
  symbols: Map<string, number>;
}

/** The law as one product (irreversible) or a difference of two (forward − backward), if it is so written. */
function massActionShape(node: MathNode): { forward: ProductShape; backward: ProductShape | null } | null {
  const top = unwrap(node);
  if (isOperatorNode(top) && top.fn === "subtract") {
    const forward = productShape(top.args[0]);
    const backward = productShape(top.args[1]);
    if (forward && backward) return { forward, backward };
  }
  const forward = productShape(top);
  return forward ? { forward, backward: null } : null;
}

function productShape(node: MathNode): ProductShape | null {
  const inner = unwrap(node);
  if (isConstantNode(inner)) return { constant: Number(inner.value), symbols: new Map() };
  if (isSymbolNode(inner)) return { constant: 1, symbols: new Map([[inner.name, 1]]) };
  if (isOperatorNode(inner) && inner.fn === "multiply") {
    const parts = inner.args.map(productShape);
    if (parts.some((part) => part === null)) return null;
    const symbols = new Map<string, number>();
    let constant = 1;
    for (const part of parts as ProductShape[]) {
      constant *= part.constant;
      for (const [name, power] of part.symbols) symbols.set(name, (symbols.get(name) ?? 0) + power);
    }
    return { constant, symbols };
  }
  const power = (isOperatorNode(inner) && inner.fn === "pow") || (isFunctionNode(inner) && inner.fn.name === "pow") ? inner.args : null;
  if (power) {
    const base = unwrap(power[0]);
    const exponent = unwrap(power[1]);
    if (isSymbolNode(base) && isConstantNode(exponent) && Number.isInteger(Number(exponent.value)) && Number(exponent.value) > 0) {
      return { constant: 1, symbols: new Map([[base.name, Number(exponent.value)]]) };
    }
  }
  return null;
}

/**
 * The law without compartment factors at its top level: `cell * (k1*E*S - k2*ES)` → the
 * difference. With every size read as 1 they change no value, and SBML authors often write them.
 */
export function withoutCompartmentFactors(node: MathNode, isCompartment: (name: string) => boolean): MathNode {
  const factors = topLevelFactors(node).filter((factor) => !(isSymbolNode(factor) && isCompartment(factor.name)));
  if (factors.length === 0) return new ConstantNode(1);
  return factors.reduce((product, factor) => new OperatorNode("*", "multiply", [product, factor]));
}

function topLevelFactors(node: MathNode): MathNode[] {
  const inner = unwrap(node);
  return isOperatorNode(inner) && inner.fn === "multiply" ? inner.args.flatMap(topLevelFactors) : [node];
}

function unwrap(node: MathNode): MathNode {
  return isParenthesisNode(node) ? unwrap(node.content) : node;
}

/** Total stoichiometry per species (a species may be listed more than once); absent means 1. */
export function stoichiometryOf(references: SbmlSpeciesReference[]): Map<string, number> {
  const totals = new Map<string, number>();
  for (const { species, stoichiometry } of references) totals.set(species, (totals.get(species) ?? 0) + (stoichiometry ?? 1));
  return totals;
}

function monomial(point: Scope, references: SbmlSpeciesReference[]): number {
  let product = 1;
  for (const [species, power] of stoichiometryOf(references)) product *= point.get(species)! ** power;
  return product;
}
