// A mechanism as an SBML Level 3 Version 2 Core document. Choices:
// - one compartment `vessel` of size 1, so amount and concentration rates coincide;
// - each step is one reaction; a reversible step stays one reaction with reversible="true" and the
//   law kf*A*B - kb*C, which keeps its label and reads back as one `<=>` step;
// - named rate coefficients become global parameters; literal numbers become local parameters
//   (k, or kf and kb) of their kinetic law, which importSbml reads back as literal numbers;
// - a coefficient written as arithmetic (`2e6*T^0.5*exp(-6000/T)`) becomes a global parameter
//   (`r1_k`, or `r1_kf` and `r1_kb`) with its value and an initial assignment holding the
//   arithmetic, which importSbml reads back as the expression;
// - a species a custom law names that is neither reactant nor product is listed as a modifier;
// - mass-action laws carry sboTerm SBO:0000012, so that checkSbml can verify them numerically;
// - every species, parameter and reaction keeps its `.weave` name in the `name` attribute.
// Steps without rate coefficients get no kinetic law; a parameter used but never given a value (an
// error in the text) becomes a parameter without a value, so that a draft still exports.
import { ConstantNode, OperatorNode, SymbolNode, type MathNode } from "mathjs";
import { lawConstants, readLaw } from "~/chem/law";
import type { Mechanism, RateExpression, RateRef, Step, Term } from "~/chem/model";
import { rateValue } from "~/chem/network";
import { rateExpressionParameters } from "~/chem/rate-expression";
import { mathmlOf } from "./mathml";
import { NameAllocator, toSId } from "./names";
import { rateExpressionNode } from "./rate-expression-math";
import { massActionSboTerm } from "./sbml-document";
import { writeXml, type XmlOut } from "./xml";

export interface SbmlExportOptions {
  title: string;
}

export function exportSbml(mechanism: Mechanism, { title }: SbmlExportOptions): string {
  const ids = new NameAllocator(toSId);
  // Parameters first: their names are already SIds and are what laws refer to.
  const parameterIds = new Map(parameterNames(mechanism).map((name) => [name, ids.take(name)]));
  const allSpecies = [...mechanism.species, ...Object.keys(mechanism.fixed).filter((name) => !mechanism.species.includes(name))];
  const speciesIds = new Map(allSpecies.map((name) => [name, ids.take(name)]));
  const compartment = ids.take("vessel");
  const modelId = ids.take(title || "mechanism");
  // Labelled steps claim their ids before generated ones, so that `r2` stays the step labelled r2.
  const reactionIds = new Map<number, string>();
  mechanism.steps.forEach(({ label }, index) => {
    if (label) reactionIds.set(index, ids.take(label));
  });
  mechanism.steps.forEach((_, index) => {
    if (!reactionIds.has(index)) reactionIds.set(index, ids.take(`r${index + 1}`));
  });
  const assigned = assignedCoefficients(mechanism, reactionIds, ids);
  const globalIds = new Set([...parameterIds.values(), ...speciesIds.values(), compartment, modelId, ...reactionIds.values(), ...[...assigned.values()].map((each) => each.id)]);

  const lawWriter = new KineticLawWriter(speciesIds, parameterIds, globalIds, assigned);
  const species: XmlOut[] = allSpecies.map((name) => {
    const fixed = name in mechanism.fixed;
    return {
      name: "species",
      attributes: {
        id: speciesIds.get(name),
        name,
        compartment,
        initialConcentration: fixed ? mechanism.fixed[name] : (mechanism.initial[name] ?? 0),
        hasOnlySubstanceUnits: false,
        boundaryCondition: fixed,
        constant: fixed,
      },
    };
  });
  const parameters: XmlOut[] = [
    ...[...parameterIds].map(([name, id]) => ({ name: "parameter", attributes: { id, name, value: mechanism.parameters[name], constant: true } })),
    ...[...assigned.values()].map(({ id, value }) => ({ name: "parameter", attributes: { id, value: value ?? undefined, constant: true } })),
  ];
  const initialAssignments: XmlOut[] = [...assigned.values()].map(({ id, expression }) => ({
    name: "initialAssignment",
    attributes: { symbol: id },
    children: [mathmlOf(rateExpressionNode(expression), (name) => parameterIds.get(name) ?? null)],
  }));
  const reactions: XmlOut[] = mechanism.steps.map((step, index) => ({
    name: "reaction",
    attributes: { id: reactionIds.get(index), name: step.label ?? undefined, reversible: step.reversible },
    children: [
      speciesList("listOfReactants", step.reactants, speciesIds),
      speciesList("listOfProducts", step.products, speciesIds),
      modifierList(step, speciesIds),
      lawWriter.kineticLaw(step, index),
    ].filter((each): each is XmlOut => each !== null),
  }));

  return writeXml({
    name: "sbml",
    attributes: { xmlns: "http://www.sbml.org/sbml/level3/version2/core", level: 3, version: 2 },
    children: [
      {
        name: "model",
        attributes: { id: modelId, name: title || undefined },
        children: [
          { name: "listOfCompartments", children: [{ name: "compartment", attributes: { id: compartment, spatialDimensions: 3, size: 1, constant: true } }] },
          nonEmptyList("listOfSpecies", species),
          nonEmptyList("listOfParameters", parameters),
          nonEmptyList("listOfInitialAssignments", initialAssignments),
          nonEmptyList("listOfReactions", reactions),
        ].filter((each): each is XmlOut => each !== null),
      },
    ],
  });
}

/** Declared parameters, then any that steps use without declaring them. */
function parameterNames(mechanism: Mechanism): string[] {
  const names = new Set(Object.keys(mechanism.parameters));
  const species = new Set([...mechanism.species, ...Object.keys(mechanism.fixed)]);
  for (const step of mechanism.steps) {
    for (const rate of [step.forward, step.backward]) {
      if (rate?.kind === "parameter") names.add(rate.name);
      if (rate?.kind === "expression") for (const name of rateExpressionParameters(rate.expression)) names.add(name);
    }
    const law = step.law === null ? null : readLaw(step.law);
    for (const symbol of law?.ok ? law.symbols : []) if (!species.has(symbol) && !lawConstants.has(symbol)) names.add(symbol);
  }
  return [...names];
}

/** A coefficient written as arithmetic, exported as a parameter set by an initial assignment. */
interface AssignedCoefficient {
  id: string;
  expression: RateExpression;
  value: number | null;
}

/** The assigned coefficients by `${step index} ${role}`, with ids named after their reactions. */
function assignedCoefficients(mechanism: Mechanism, reactionIds: Map<number, string>, ids: NameAllocator): Map<string, AssignedCoefficient> {
  const assigned = new Map<string, AssignedCoefficient>();
  mechanism.steps.forEach((step, index) => {
    if (step.law !== null) return;
    const roles: [RateRef | null, "k" | "kf" | "kb"][] = step.reversible ? [[step.forward, "kf"], [step.backward, "kb"]] : [[step.forward, "k"]];
    for (const [rate, role] of roles) {
      if (rate?.kind !== "expression") continue;
      assigned.set(`${index} ${role}`, { id: ids.take(`${reactionIds.get(index)}_${role}`), expression: rate.expression, value: rateValue(rate, mechanism) });
    }
  });
  return assigned;
}

/** Species a custom law names besides the step's reactants and products: SBML wants them as modifiers. */
function modifierList(step: Step, speciesIds: Map<string, string>): XmlOut | null {
  if (step.law === null) return null;
  const reading = readLaw(step.law);
  const inStep = new Set([...step.reactants, ...step.products].map((term) => term.species));
  const modifiers = (reading.ok ? reading.symbols : []).filter((name) => speciesIds.has(name) && !inStep.has(name));
  return nonEmptyList(
    "listOfModifiers",
    modifiers.map((name) => ({ name: "modifierSpeciesReference", attributes: { species: speciesIds.get(name) } })),
  );
}

/** SBML lists must not be empty. */
function nonEmptyList(name: string, items: XmlOut[]): XmlOut | null {
  return items.length > 0 ? { name, children: items } : null;
}

/** Species references with repeated species merged (`X + X` is one reference of stoichiometry 2). */
function speciesList(name: string, terms: Term[], speciesIds: Map<string, string>): XmlOut | null {
  return nonEmptyList(
    name,
    [...stoichiometry(terms)].map(([species, coefficient]) => ({
      name: "speciesReference",
      attributes: { species: speciesIds.get(species), stoichiometry: coefficient, constant: true },
    })),
  );
}

function stoichiometry(terms: Term[]): Map<string, number> {
  const totals = new Map<string, number>();
  for (const { species, coefficient } of terms) totals.set(species, (totals.get(species) ?? 0) + coefficient);
  return totals;
}

class KineticLawWriter {
  /** Ids of the local parameters that carry literal numbers, the same in every law. */
  private readonly localIds: Record<"k" | "kf" | "kb", string>;

  constructor(
    private readonly speciesIds: Map<string, string>,
    private readonly parameterIds: Map<string, string>,
    globalIds: Set<string>,
    private readonly assigned: Map<string, AssignedCoefficient>,
  ) {
    // Local ids avoid every model-wide id, so that no local parameter shadows a species or parameter.
    const locals = new NameAllocator(toSId, globalIds);
    this.localIds = { k: locals.take("k"), kf: locals.take("kf"), kb: locals.take("kb") };
  }

  kineticLaw(step: Step, index: number): XmlOut | null {
    if (step.law !== null) return this.customLaw(step.law);
    if (step.forward === null || (step.reversible && step.backward === null)) return null;
    const localParameters: XmlOut[] = [];
    const coefficient = (rate: RateRef, role: "k" | "kf" | "kb"): MathNode => {
      if (rate.kind === "parameter") return new SymbolNode(this.parameterIds.get(rate.name)!);
      if (rate.kind === "expression") return new SymbolNode(this.assigned.get(`${index} ${role}`)!.id);
      const id = this.localIds[role];
      localParameters.push({ name: "localParameter", attributes: { id, value: rate.value } });
      return new SymbolNode(id);
    };
    let rate = this.massAction(coefficient(step.forward, step.reversible ? "kf" : "k"), step.reactants);
    if (step.reversible) {
      rate = new OperatorNode("-", "subtract", [rate, this.massAction(coefficient(step.backward!, "kb"), step.products)]);
    }
    return {
      name: "kineticLaw",
      attributes: { sboTerm: massActionSboTerm },
      children: [mathmlOf(rate, (id) => id), ...(localParameters.length > 0 ? [{ name: "listOfLocalParameters", children: localParameters }] : [])],
    };
  }

  /** coefficient · Π species^stoichiometry, species written by their SIds. */
  private massAction(coefficient: MathNode, terms: Term[]): MathNode {
    const factors = [...stoichiometry(terms)].map(([species, power]): MathNode => {
      const symbol = new SymbolNode(this.speciesIds.get(species)!);
      return power === 1 ? symbol : new OperatorNode("^", "pow", [symbol, new ConstantNode(power)]);
    });
    return factors.reduce((product, factor) => new OperatorNode("*", "multiply", [product, factor]), coefficient);
  }

  private customLaw(law: string): XmlOut {
    const reading = readLaw(law);
    if (!reading.ok) throw new Error(`The rate law { ${law} } cannot be read: ${reading.message}`);
    const idOf = (name: string) => this.speciesIds.get(name) ?? this.parameterIds.get(name) ?? null;
    return { name: "kineticLaw", children: [mathmlOf(reading.node, idOf)] };
  }
}
