// SBML (Level 3 Core, or Level 2) to `.weave` text. Mass-action kinetic laws become rate coefficients (a model
// parameter by name, a literal or local parameter as its number); any other law is kept as a custom
// law with a warning. A mass-action coefficient that is a parameter set by an initial assignment
// of plain arithmetic (numbers, parameters, + - * / ^, exp, ln, sqrt) is read as that expression. Either the whole file is translated or nothing is: the result is parsed back
// and any error refuses the import.
import { ConstantNode, SymbolNode, isSymbolNode } from "mathjs";
import { checkSourceLimits } from "~/chem/limits";
import type { Mechanism, RateRef, Step, Term } from "~/chem/model";
import { parseMechanism, printMechanism } from "~/chem/parse";
import { KineticLawReader, stoichiometryOf, withoutCompartmentFactors, type KineticLawReading, type SbmlCoefficient } from "./kinetic-law";
import { NameAllocator, isWeaveIdentifier, toWeaveIdentifier } from "./names";
import { rateExpressionOf } from "./rate-expression-math";
import { readSbml, type SbmlModel, type SbmlReaction, type SbmlSpecies } from "./sbml-document";

export type SbmlImport = { source: string; warnings: string[]; title?: string } | { errors: string[] };

export function importSbml(xml: string): SbmlImport {
  const reading = readSbml(xml);
  if (!reading.ok) return { errors: reading.errors };
  const translation = new Translation(reading.model).translate();
  if ("errors" in translation) return translation;
  const limit = checkSourceLimits(translation.source);
  if (limit) return { errors: [limit] };
  const readBack = parseMechanism(translation.source).diagnostics.filter((each) => each.severity === "error");
  if (readBack.length > 0) {
    return { errors: readBack.map((each) => `The translated mechanism does not read back (line ${each.line}): ${each.message}`) };
  }
  return translation;
}

class Translation {
  private readonly errors: string[] = [];
  private readonly warnings: string[] = [];
  /** Species and parameters share one namespace in `.weave`; `fixed` is its keyword. */
  private readonly names = new NameAllocator(undefined, ["fixed"]);
  private readonly labels = new NameAllocator(undefined, ["fixed"]);
  private readonly parameterNames = new Map<string, string>();
  private readonly speciesNames = new Map<string, string>();
  private readonly parameters: Record<string, number> = {};
  private readonly compartments: Set<string>;
  private readonly laws: Map<SbmlReaction, KineticLawReading>;
  /** Species that are a reactant or product somewhere. */
  private readonly inReactions: Set<string>;
  /** Parameters whose initial assignment became a step's coefficient expression. */
  private readonly assignmentsUsed = new Set<string>();

  constructor(private readonly model: SbmlModel) {
    this.compartments = new Set(model.compartments.map((each) => each.id));
    const reader = new KineticLawReader(model);
    this.laws = new Map(model.reactions.map((reaction) => [reaction, reader.read(reaction)]));
    this.inReactions = new Set(model.reactions.flatMap((reaction) => [...reaction.reactants, ...reaction.products].map((each) => each.species)));
  }

  translate(): SbmlImport {
    this.noteUnreadParts();
    this.nameParameters();
    const used = this.nameSpecies();
    const steps = this.model.reactions.flatMap((reaction) => this.step(reaction) ?? []);
    if (this.errors.length > 0) return { errors: this.errors };
    this.settleAssignments();

    const fixed: Record<string, number> = {};
    const initial: Record<string, number> = {};
    for (const species of used) {
      const name = this.speciesNames.get(species.id)!;
      const value = species.initialConcentration ?? species.initialAmount;
      if (this.isFixed(species)) {
        fixed[name] = value ?? 0;
        if (value === null) this.warnings.push(`Species ${species.id} is held constant but has no initial value; it is held at 0.`);
      } else if (value !== null && value !== 0) {
        initial[name] = value;
      }
    }
    const speciesOrder = [...new Set(steps.flatMap((step) => [...step.reactants, ...step.products].map((term) => term.species)))];
    const mechanism: Mechanism = { steps, species: speciesOrder.filter((name) => !(name in fixed)), fixed, parameters: this.parameters, initial };
    const title = (this.model.name ?? this.model.id ?? "").trim() || undefined;
    const header = `# Imported from SBML Level ${this.model.level} Version ${this.model.version}${title ? `: ${title.replace(/\s+/g, " ")}` : ""}\n`;
    return { source: header + printMechanism(mechanism), warnings: this.warnings, ...(title ? { title } : {}) };
  }

  // ---- the model as a whole

  private noteUnreadParts(): void {
    if (this.model.unread.length > 0) {
      this.warnings.push(`Not imported: the file's ${this.model.unread.join(", ")}. Mechweave reads species, parameters and reactions with their kinetic laws.`);
    }
    const sizes = this.model.compartments.map((each) => each.size);
    if (sizes.length > 1 || sizes.some((size) => size !== null && size !== 1)) {
      this.warnings.push("Mechweave models one well-mixed volume: every compartment is read with size 1, and concentrations as given.");
    }
  }

  private nameParameters(): void {
    const usedInLaws = this.symbolsInLaws();
    for (const parameter of this.model.parameters) {
      if (parameter.value === null) {
        if (!usedInLaws.has(parameter.id)) this.warnings.push(`Parameter ${parameter.id} has no value and no law uses it; it is left out.`);
        continue;
      }
      const name = this.names.take(toWeaveIdentifier(parameter.id));
      this.parameterNames.set(parameter.id, name);
      this.parameters[name] = parameter.value;
    }
  }

  /**
   * Weave names for the species that take part: the SBML name when it is usable (custom laws can
   * only refer to identifiers), else the id. Returns the species that take part, in file order.
   */
  private nameSpecies(): SbmlSpecies[] {
    const inReactions = this.inReactions;
    const inCustomLaws = this.symbolsInLaws((reading) => reading.kind === "custom");
    const nameCounts = new Map<string, number>();
    for (const { name } of this.model.species) if (name !== null) nameCounts.set(name, (nameCounts.get(name) ?? 0) + 1);

    const used = this.model.species.filter((species) => inReactions.has(species.id) || inCustomLaws.has(species.id));
    const unused = this.model.species.filter((species) => !inReactions.has(species.id) && !inCustomLaws.has(species.id));
    if (unused.length > 0) {
      const [takes, is] = unused.length === 1 ? ["takes", "is"] : ["take", "are"];
      this.warnings.push(`Species ${unused.map((each) => each.id).join(", ")} ${takes} part in no reaction and ${is} left out.`);
    }
    for (const species of used) {
      const name = species.name;
      const usable =
        name !== null &&
        nameCounts.get(name) === 1 &&
        name === name.trim() &&
        name !== "" &&
        !/["\n\r]/.test(name) &&
        (isWeaveIdentifier(name) || !inCustomLaws.has(species.id));
      this.speciesNames.set(species.id, this.names.take(usable ? name : toWeaveIdentifier(species.id)));
      if (!inReactions.has(species.id) && !species.boundaryCondition) {
        this.warnings.push(`Species ${species.id} appears only in rate laws, so nothing changes it: it is held at its initial concentration (fixed).`);
      }
    }
    return used;
  }

  private isFixed(species: SbmlSpecies): boolean {
    return species.boundaryCondition || !this.inReactions.has(species.id);
  }

  /** Model-wide ids that the kinetic laws (of the readings that pass the filter) refer to. */
  private symbolsInLaws(filter: (reading: KineticLawReading) => boolean = () => true): Set<string> {
    const symbols = new Set<string>();
    for (const [reaction, reading] of this.laws) {
      if (!filter(reading)) continue;
      reaction.law?.math?.traverse((node, path) => {
        if (isSymbolNode(node) && path !== "fn" && !reaction.law!.localParameters.has(node.name)) symbols.add(node.name);
      });
    }
    return symbols;
  }

  // ---- reactions

  private step(reaction: SbmlReaction): Step | null {
    const reactants = this.terms(reaction, "reactants");
    const products = this.terms(reaction, "products");
    if (!reactants || !products) return null;
    if (reactants.length === 0 && products.length === 0) {
      this.warnings.push(`Reaction ${reaction.id} has neither reactants nor products and is left out.`);
      return null;
    }
    if (sameComplex(reactants, products)) {
      this.warnings.push(`Reaction ${reaction.id} has the same species on both sides, so it changes nothing; it is left out.`);
      return null;
    }
    const label = this.labels.take(reaction.name !== null && isWeaveIdentifier(reaction.name) ? reaction.name : toWeaveIdentifier(reaction.id));
    const step: Step = { label, reactants, products, reversible: false, forward: null, backward: null, law: null, line: 0, from: 0, to: 0 };
    const reading = this.laws.get(reaction)!;
    const where = `Reaction ${reaction.id}`;
    if (!reaction.law?.math) {
      this.warnings.push(`${where} has no kinetic law, so its step has no rate coefficient.`);
      return step;
    }
    switch (reading.kind) {
      case "unevaluable":
        this.errors.push(`${where}: its kinetic law cannot be evaluated: ${reading.reason}.`);
        return null;
      case "custom":
        step.law = this.customLaw(reaction, label);
        this.warnings.push(
          `${where}: its kinetic law is not mass action (${reading.reason}); it is kept as a custom rate law${reaction.reversible ? " on one irreversible step giving the net rate" : ""}.`,
        );
        return step;
      case "mass-action":
        step.forward = this.rate(reading.forward);
        step.reversible = reading.backward !== null;
        step.backward = reading.backward ? this.rate(reading.backward) : null;
        if (reaction.reversible && !reading.backward) this.warnings.push(`${where} is marked reversible but its kinetic law has no backward term; it is read as irreversible.`);
        if (reading.folded) this.warnings.push(`${where}: its rate coefficient combines several parameters and is written as its value.`);
        return step;
    }
  }

  private terms(reaction: SbmlReaction, side: "reactants" | "products"): Term[] | null {
    const references = reaction[side];
    if (references.some((each) => each.stoichiometry === null)) {
      this.warnings.push(`Reaction ${reaction.id}: a species reference gives no stoichiometry; it is read as 1.`);
    }
    const terms: Term[] = [];
    for (const [species, coefficient] of stoichiometryOf(references)) {
      if (!Number.isInteger(coefficient)) {
        this.errors.push(`Reaction ${reaction.id}: the stoichiometry ${coefficient} of ${species} is not a whole number; a .weave step counts molecules.`);
        return null;
      }
      terms.push({ species: this.speciesNames.get(species)!, coefficient });
    }
    return terms;
  }

  private rate(coefficient: SbmlCoefficient): RateRef {
    if (coefficient.kind === "value") return { kind: "value", value: coefficient.value };
    const assignment = this.model.initialAssignments.find((each) => each.symbol === coefficient.id);
    const expression = assignment?.math ? rateExpressionOf(assignment.math, (id) => this.parameterNames.get(id) ?? null) : null;
    if (expression) {
      this.assignmentsUsed.add(coefficient.id);
      return { kind: "expression", expression };
    }
    return { kind: "parameter", name: this.parameterNames.get(coefficient.id)! };
  }

  /**
   * A parameter that only carried an expression into kinetic laws is not a parameter of the
   * mechanism; any other initial assignment is not read, and the author is told.
   */
  private settleAssignments(): void {
    const inCustomLaws = this.symbolsInLaws((reading) => reading.kind === "custom");
    for (const id of this.assignmentsUsed) {
      if (!inCustomLaws.has(id)) delete this.parameters[this.parameterNames.get(id)!];
    }
    const unread = this.model.initialAssignments.filter((each) => !this.assignmentsUsed.has(each.symbol)).map((each) => each.symbol);
    if (unread.length > 0) {
      this.warnings.push(`Not imported: the initial assignments to ${unread.join(", ")}; their values as given in the file are used.`);
    }
  }

  /**
   * The law in mathjs syntax with `.weave` names. `.weave` has no per-step scope, so local
   * parameters become model parameters named after the step; compartments (size 1) drop out.
   */
  private customLaw(reaction: SbmlReaction, label: string): string {
    const locals = new Map<string, string>();
    for (const [id, value] of reaction.law!.localParameters) {
      // A local parameter without a value cannot be in use: the law would not have evaluated.
      if (value === null) continue;
      const name = this.names.take(toWeaveIdentifier(`${label}_${id}`));
      locals.set(id, name);
      this.parameters[name] = value;
    }
    const isCompartment = (name: string) => this.compartments.has(name) && !locals.has(name);
    const renamed = withoutCompartmentFactors(reaction.law!.math!, isCompartment).transform((node, path) => {
      if (!isSymbolNode(node) || path === "fn") return node;
      if (locals.has(node.name)) return new SymbolNode(locals.get(node.name)!);
      if (isCompartment(node.name)) return new ConstantNode(1);
      return new SymbolNode(this.speciesNames.get(node.name) ?? this.parameterNames.get(node.name)!);
    });
    return renamed.toString({ parenthesis: "auto", implicit: "show" });
  }
}

function sameComplex(a: Term[], b: Term[]): boolean {
  const key = (terms: Term[]) => terms.map((term) => `${term.coefficient} ${term.species}`).sort().join("+");
  return key(a) === key(b);
}
