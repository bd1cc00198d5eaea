// Reads SBML Level 3 Core text into typed records, checking the rules that need no outside data:
// well-formed XML, the sbml root and namespace, required attributes and their types, unique SIds,
// and that every reference (compartment, species, unit, MathML name) resolves. Every problem is
// collected, so one pass tells the author everything that is wrong. Level 2 files, which many
// published models still are, are read too: there the attributes Level 3 requires have defaults.
import { isSymbolNode, type MathNode } from "mathjs";
import { readMathml, type Lambda } from "./mathml";
import { isSId } from "./names";
import { child, listed, readXml, type XmlElement } from "./xml";

const sbmlNamespaces: Record<string, { level: number; version: number }> = {
  "http://www.sbml.org/sbml/level2": { level: 2, version: 1 },
  "http://www.sbml.org/sbml/level2/version2": { level: 2, version: 2 },
  "http://www.sbml.org/sbml/level2/version3": { level: 2, version: 3 },
  "http://www.sbml.org/sbml/level2/version4": { level: 2, version: 4 },
  "http://www.sbml.org/sbml/level2/version5": { level: 2, version: 5 },
  "http://www.sbml.org/sbml/level3/version1/core": { level: 3, version: 1 },
  "http://www.sbml.org/sbml/level3/version2/core": { level: 3, version: 2 },
};

/** The SBO term for a mass-action rate law (Systems Biology Ontology). */
export const massActionSboTerm = "SBO:0000012";

export interface SbmlCompartment {
  id: string;
  size: number | null;
}

export interface SbmlSpecies {
  id: string;
  name: string | null;
  compartment: string;
  initialConcentration: number | null;
  initialAmount: number | null;
  boundaryCondition: boolean;
  constant: boolean;
}

export interface SbmlParameter {
  id: string;
  value: number | null;
}

export interface SbmlSpeciesReference {
  species: string;
  /** Null when the attribute is absent (L3 leaves it undefined; read as 1 with a warning). */
  stoichiometry: number | null;
}

export interface SbmlKineticLaw {
  /** Null for a kinetic law without math (allowed in Level 3 Version 2). */
  math: MathNode | null;
  sboTerm: string | null;
  /** Local parameters shadow model-wide names inside this law. */
  localParameters: Map<string, number | null>;
}

export interface SbmlReaction {
  id: string;
  name: string | null;
  reversible: boolean;
  reactants: SbmlSpeciesReference[];
  products: SbmlSpeciesReference[];
  modifiers: string[];
  law: SbmlKineticLaw | null;
}

/** A value set at the start by math (`symbol` = math); math is null until read. */
export interface SbmlInitialAssignment {
  symbol: string;
  math: MathNode | null;
}

export interface SbmlModel {
  level: number;
  version: number;
  id: string | null;
  name: string | null;
  compartments: SbmlCompartment[];
  species: SbmlSpecies[];
  parameters: SbmlParameter[];
  reactions: SbmlReaction[];
  initialAssignments: SbmlInitialAssignment[];
  /** Model components present in the file that Mechweave does not read (rules, events, …). */
  unread: string[];
}

export type SbmlReading = { ok: true; model: SbmlModel } | { ok: false; errors: string[] };

/** The base units of SBML Level 3; Level 2 lacks avogadro and (Version 1 only) has Celsius. */
const level3BaseUnits = (
  "ampere avogadro becquerel candela coulomb dimensionless farad gram gray henry hertz item joule katal kelvin " +
  "kilogram litre lumen lux metre mole newton ohm pascal radian second siemens sievert steradian tesla volt watt weber"
).split(" ");

function baseUnitsOf(level: number, version: number): Set<string> {
  if (level === 3) return new Set(level3BaseUnits);
  return new Set([...level3BaseUnits.filter((unit) => unit !== "avogadro"), ...(version === 1 ? ["Celsius"] : [])]);
}

/** Level 2's predefined units, which unit attributes may name without defining them. */
const level2DefaultUnits = ["substance", "volume", "area", "length", "time"];

/** Lists a model may hold that carry meaning Mechweave cannot represent. */
const unreadLists: Record<string, string> = {
  listOfRules: "rules",
  listOfConstraints: "constraints",
  listOfEvents: "events",
};

export function readSbml(text: string): SbmlReading {
  const xml = readXml(text);
  if (!xml.ok) return { ok: false, errors: [xml.error] };
  const root = xml.root;
  if (root.name !== "sbml") return { ok: false, errors: [`This is not an SBML file: its root element is <${root.name}>, not <sbml>.`] };
  const declared = sbmlNamespaces[root.namespace];
  if (!declared) {
    const level = root.attributes.level ?? "?";
    const version = root.attributes.version ?? "?";
    return {
      ok: false,
      errors: [
        /level1/.test(root.namespace) || level === "1"
          ? `This is SBML Level ${level} Version ${version}; Mechweave reads SBML Levels 2 and 3. Convert the file to Level 3 first.`
          : `The <sbml> element must declare the SBML Level 3 Core namespace (xmlns="http://www.sbml.org/sbml/level3/version2/core"); found "${root.namespace || "none"}".`,
      ],
    };
  }
  return new SbmlReader(declared.level, declared.version).read(root);
}

/** A kinetic law's MathML, read once every model-wide id is known. */
interface PendingMath {
  /** What holds the math, for messages: "The kinetic law of reaction r1". */
  owner: string;
  element: XmlElement;
  locals: Set<string>;
  assign: (node: MathNode) => void;
}

type IdKind = "compartment" | "species" | "parameter" | "reaction" | "function definition" | "species reference";

class SbmlReader {
  private readonly errors: string[] = [];
  /** The model-wide SId namespace. */
  private readonly ids = new Map<string, IdKind>();
  /** Unit definitions have their own namespace (UnitSId). */
  private readonly unitIds = new Set<string>();
  private readonly baseUnits: Set<string>;
  private readonly functions = new Map<string, Lambda>();
  private readonly pendingMath: PendingMath[] = [];
  private readonly assignedSymbols = new Set<string>();

  constructor(
    private readonly level: number,
    private readonly version: number,
  ) {
    this.baseUnits = baseUnitsOf(level, version);
  }

  read(root: XmlElement): SbmlReading {
    this.matches(root, "level", String(this.level));
    this.matches(root, "version", String(this.version));
    this.checkCommonAttributes(root, new Set());
    // A package the file marks as required changes the meaning of the core model.
    const packages = Object.entries(root.attributes)
      .filter(([name, value]) => name.endsWith(":required") && value === "true")
      .map(([name]) => `required SBML package ${name.slice(0, -":required".length)}`);
    const models = root.children.filter((each) => each.name === "model");
    if (models.length !== 1) {
      return { ok: false, errors: [...this.errors, models.length === 0 ? "The <sbml> element holds no <model>." : "The <sbml> element holds more than one <model>."] };
    }
    const element = models[0];
    const id = this.optionalId(element, "model");
    for (const each of listed(element, "listOfUnitDefinitions", "unitDefinition")) this.unitDefinition(each);
    this.units(element, "substanceUnits", "timeUnits", "volumeUnits", "areaUnits", "lengthUnits", "extentUnits");
    for (const each of listed(element, "listOfFunctionDefinitions", "functionDefinition")) this.functionDefinition(each);
    const compartments = listed(element, "listOfCompartments", "compartment").map((each) => this.compartment(each));
    const species = listed(element, "listOfSpecies", "species").map((each) => this.species(each));
    const parameters = listed(element, "listOfParameters", "parameter").map((each) => this.parameter(each));
    const reactions = listed(element, "listOfReactions", "reaction").map((each) => this.reaction(each));
    const initialAssignments = listed(element, "listOfInitialAssignments", "initialAssignment").map((each) => this.initialAssignment(each));
    this.checkSpeciesReferences(species, compartments, reactions);
    for (const each of [element, ...listed(element, "listOfSpecies", "species")]) this.conversionFactor(each);
    for (const pending of this.pendingMath) this.resolveMath(pending);
    if (this.errors.length > 0) return { ok: false, errors: this.errors };
    const unread = [
      ...Object.entries(unreadLists)
        .filter(([list]) => (child(element, list)?.children.length ?? 0) > 0)
        .map(([, what]) => what),
      ...packages,
    ];
    return {
      ok: true,
      model: { level: this.level, version: this.version, id, name: element.attributes.name ?? null, compartments, species, parameters, reactions, initialAssignments, unread },
    };
  }

  // ---- components

  private functionDefinition(element: XmlElement): void {
    const id = this.id(element, "function definition");
    const lambda = child(element, "math")?.children[0];
    if (!lambda || lambda.name !== "lambda") {
      this.errors.push(`${describe(element)}: its <math> must hold a <lambda>.`);
      return;
    }
    const parameters = lambda.children.filter((each) => each.name === "bvar").map((bvar) => child(bvar, "ci")?.text ?? "");
    const body = lambda.children.filter((each) => each.name !== "bvar");
    if (body.length !== 1 || parameters.some((name) => !name)) {
      this.errors.push(`${describe(element)}: its <lambda> must list <bvar><ci>…</ci></bvar> arguments and then one expression.`);
      return;
    }
    if (id) this.functions.set(id, { parameters, body: body[0] });
  }

  private unitDefinition(element: XmlElement): void {
    const id = this.required(element, "id");
    if (id && !isSId(id)) this.errors.push(`${describe(element)}: "${id}" is not a valid unit id.`);
    else if (this.baseUnits.has(id)) this.errors.push(`${describe(element)}: ${id} is a base unit and cannot be redefined.`);
    else if (this.unitIds.has(id)) this.errors.push(`The unit id ${id} is defined twice.`);
    this.unitIds.add(id);
    for (const unit of listed(element, "listOfUnits", "unit")) {
      const kind = this.required(unit, "kind");
      if (kind && !this.baseUnits.has(kind)) this.errors.push(`A <unit> of unit definition ${id}: kind="${kind}" is not an SBML base unit.`);
      for (const attribute of ["exponent", "scale", "multiplier"]) {
        if (this.level === 2 || this.required(unit, attribute)) this.number(unit, attribute);
      }
    }
  }

  /** Unit attributes must name a base unit or a unit definition. */
  private units(element: XmlElement, ...attributes: string[]): void {
    for (const attribute of attributes) {
      const unit = element.attributes[attribute];
      if (unit === undefined) continue;
      const predefined = this.baseUnits.has(unit) || (this.level === 2 && level2DefaultUnits.includes(unit));
      if (!predefined && !this.unitIds.has(unit)) {
        this.errors.push(`${describe(element)}: ${attribute}="${unit}" is neither an SBML base unit nor a unit definition in the file.`);
      }
    }
  }

  private conversionFactor(element: XmlElement): void {
    const factor = element.attributes.conversionFactor;
    if (factor !== undefined && this.ids.get(factor) !== "parameter") {
      this.errors.push(`${describe(element)}: its conversionFactor ${factor} is not a parameter of the model.`);
    }
  }

  private compartment(element: XmlElement): SbmlCompartment {
    const id = this.id(element, "compartment");
    this.units(element, "units");
    this.flag(element, "constant", true);
    return { id, size: this.number(element, "size") };
  }

  private species(element: XmlElement): SbmlSpecies {
    const id = this.id(element, "species");
    this.units(element, "substanceUnits");
    const compartment = this.required(element, "compartment");
    this.flag(element, "hasOnlySubstanceUnits", false);
    const initialConcentration = this.number(element, "initialConcentration");
    const initialAmount = this.number(element, "initialAmount");
    if (initialConcentration !== null && initialAmount !== null) {
      this.errors.push(`${describe(element)}: give initialConcentration or initialAmount, not both.`);
    }
    for (const [value, what] of [[initialConcentration, "initialConcentration"], [initialAmount, "initialAmount"]] as const) {
      if (value !== null && value < 0) this.errors.push(`${describe(element)}: ${what} cannot be negative (${value}).`);
    }
    return {
      id,
      name: element.attributes.name ?? null,
      compartment,
      initialConcentration,
      initialAmount,
      boundaryCondition: this.flag(element, "boundaryCondition", false),
      constant: this.flag(element, "constant", false),
    };
  }

  private parameter(element: XmlElement): SbmlParameter {
    const id = this.id(element, "parameter");
    this.units(element, "units");
    this.flag(element, "constant", true);
    return { id, value: this.number(element, "value") };
  }

  private reaction(element: XmlElement): SbmlReaction {
    const id = this.id(element, "reaction");
    const reversible = this.flag(element, "reversible", true);
    // `fast` is required in Level 3 Version 1, optional before and removed in Version 2.
    if (this.level === 2 || this.version === 1) this.flag(element, "fast", false);
    const reference = (each: XmlElement): SbmlSpeciesReference => {
      this.optionalId(each, "species reference");
      if (this.level === 3) this.flag(each, "constant", true);
      if (child(each, "stoichiometryMath")) this.errors.push(`${describe(each)} in reaction ${id}: stoichiometryMath is not supported; give a number.`);
      // Level 2 defaults a missing stoichiometry to 1; Level 3 leaves it undefined.
      const stoichiometry = this.number(each, "stoichiometry") ?? (this.level === 2 ? 1 : null);
      if (stoichiometry !== null && stoichiometry <= 0) this.errors.push(`${describe(each)} in reaction ${id}: stoichiometry must be positive (${stoichiometry}).`);
      return { species: this.required(each, "species"), stoichiometry };
    };
    const reactants = listed(element, "listOfReactants", "speciesReference").map(reference);
    const products = listed(element, "listOfProducts", "speciesReference").map(reference);
    const modifiers = listed(element, "listOfModifiers", "modifierSpeciesReference").map((each) => {
      this.optionalId(each, "species reference");
      return this.required(each, "species");
    });
    const lawElement = child(element, "kineticLaw");
    return { id, name: element.attributes.name ?? null, reversible, reactants, products, modifiers, law: lawElement ? this.kineticLaw(lawElement, id) : null };
  }

  private initialAssignment(element: XmlElement): SbmlInitialAssignment {
    const symbol = this.required(element, "symbol");
    const assignment: SbmlInitialAssignment = { symbol, math: null };
    if (symbol && !this.ids.has(symbol)) this.errors.push(`${describe(element)}: its symbol ${symbol} is not defined in the model.`);
    if (symbol && this.assignedSymbols.has(symbol)) this.errors.push(`${describe(element)}: ${symbol} has more than one initial assignment.`);
    this.assignedSymbols.add(symbol);
    const math = child(element, "math");
    if (!math) this.errors.push(`${describe(element)}: it has no <math>.`);
    else this.pendingMath.push({ owner: `The initial assignment to ${symbol}`, element: math, locals: new Set(), assign: (node) => (assignment.math = node) });
    return assignment;
  }

  private kineticLaw(element: XmlElement, reaction: string): SbmlKineticLaw {
    const localParameters = new Map<string, number | null>();
    const [list, item] = this.level === 3 ? ["listOfLocalParameters", "localParameter"] : ["listOfParameters", "parameter"];
    for (const each of listed(element, list, item)) {
      const id = this.required(each, "id");
      this.units(each, "units");
      if (id && !isSId(id)) this.errors.push(`${describe(each)} in reaction ${reaction}: "${id}" is not a valid SId.`);
      if (localParameters.has(id)) this.errors.push(`Reaction ${reaction}: the local parameter id ${id} is used twice in its kinetic law.`);
      localParameters.set(id, this.number(each, "value"));
    }
    const sboTerm = element.attributes.sboTerm ?? null;
    const law: SbmlKineticLaw = { math: null, sboTerm, localParameters };
    const math = child(element, "math");
    if (math) this.pendingMath.push({ owner: `The kinetic law of reaction ${reaction}`, element: math, locals: new Set(localParameters.keys()), assign: (node) => (law.math = node) });
    return law;
  }

  /** sboTerm and metaid, which any SBML element may carry; annotations, notes and math are not SBML. */
  private checkCommonAttributes(element: XmlElement, metaids: Set<string>): void {
    const { sboTerm, metaid } = element.attributes;
    if (sboTerm !== undefined && !/^SBO:\d{7}$/.test(sboTerm)) this.errors.push(`${describe(element)}: sboTerm "${sboTerm}" is not of the form SBO:0000012.`);
    if (metaid !== undefined) {
      if (metaids.has(metaid)) this.errors.push(`The metaid ${metaid} is used twice; metaids must be unique in a document.`);
      metaids.add(metaid);
    }
    for (const each of element.children) {
      if (each.name !== "annotation" && each.name !== "notes" && each.name !== "math") this.checkCommonAttributes(each, metaids);
    }
  }

  // ---- cross-references

  private checkSpeciesReferences(species: SbmlSpecies[], compartments: SbmlCompartment[], reactions: SbmlReaction[]): void {
    const compartmentIds = new Set(compartments.map((each) => each.id));
    const byId = new Map(species.map((each) => [each.id, each]));
    for (const each of species) {
      if (each.compartment && !compartmentIds.has(each.compartment)) {
        this.errors.push(`Species ${each.id}: its compartment ${each.compartment} is not defined in listOfCompartments.`);
      }
    }
    for (const reaction of reactions) {
      for (const [role, references] of [["reactant", reaction.reactants], ["product", reaction.products]] as const) {
        for (const { species: id } of references) {
          const target = byId.get(id);
          if (!id) continue;
          if (!target) this.errors.push(`Reaction ${reaction.id}: its ${role} ${id} is not a species defined in listOfSpecies.`);
          else if (target.constant && !target.boundaryCondition) {
            this.errors.push(`Reaction ${reaction.id}: species ${id} is constant but not a boundary species, so it cannot be a ${role}.`);
          }
        }
      }
      for (const id of reaction.modifiers) {
        if (id && !byId.has(id)) this.errors.push(`Reaction ${reaction.id}: its modifier ${id} is not a species defined in listOfSpecies.`);
      }
    }
  }

  private resolveMath({ owner, element, locals, assign }: PendingMath): void {
    const reading = readMathml(element, this.functions);
    if (!reading.ok) {
      this.errors.push(`${owner} cannot be read: ${reading.message}.`);
      return;
    }
    const unknown = new Set<string>();
    reading.node.traverse((node, path) => {
      if (isSymbolNode(node) && path !== "fn" && !locals.has(node.name) && !this.ids.has(node.name)) unknown.add(node.name);
    });
    for (const name of unknown) {
      this.errors.push(`${owner} uses ${name}, which is neither a local parameter nor defined in the model.`);
    }
    assign(reading.node);
  }

  // ---- attributes

  private id(element: XmlElement, kind: IdKind): string {
    const id = this.required(element, "id");
    if (id) this.register(element, id, kind);
    return id;
  }

  private optionalId(element: XmlElement, kind: IdKind | "model"): string | null {
    const id = element.attributes.id;
    if (id === undefined) return null;
    if (kind === "model") {
      if (!isSId(id)) this.errors.push(`${describe(element)}: "${id}" is not a valid SId (letters, digits and _, not starting with a digit).`);
    } else {
      this.register(element, id, kind);
    }
    return id;
  }

  private register(element: XmlElement, id: string, kind: IdKind): void {
    if (!isSId(id)) {
      this.errors.push(`${describe(element)}: "${id}" is not a valid SId (letters, digits and _, not starting with a digit).`);
      return;
    }
    const earlier = this.ids.get(id);
    if (earlier) {
      const by = earlier === kind ? `two ${kind === "species" ? kind : `${kind}s`}` : `a ${earlier} and a ${kind}`;
      this.errors.push(`The id ${id} is used twice, by ${by}; SIds must be unique in a model.`);
    }
    else this.ids.set(id, kind);
  }

  private required(element: XmlElement, attribute: string): string {
    const value = element.attributes[attribute];
    if (value === undefined || value.trim() === "") {
      this.errors.push(`${describe(element)}: the required attribute ${attribute} is missing.`);
      return "";
    }
    return value.trim();
  }

  private matches(element: XmlElement, attribute: string, expected: string): void {
    const value = this.required(element, attribute);
    if (value && value !== expected) this.errors.push(`${describe(element)}: ${attribute}="${value}" does not match the namespace, which says ${expected}.`);
  }

  /** A boolean attribute: required in Level 3, `level2Default` when a Level 2 file leaves it out. */
  private flag(element: XmlElement, attribute: string, level2Default: boolean): boolean {
    const value = element.attributes[attribute]?.trim();
    if (value === undefined) {
      if (this.level === 2) return level2Default;
      this.errors.push(`${describe(element)}: the required attribute ${attribute} is missing.`);
      return false;
    }
    if (value === "true" || value === "1") return true;
    if (value === "false" || value === "0") return false;
    this.errors.push(`${describe(element)}: ${attribute}="${value}" must be true or false.`);
    return false;
  }

  private number(element: XmlElement, attribute: string): number | null {
    const value = element.attributes[attribute]?.trim();
    if (value === undefined) return null;
    if (!/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(value)) {
      const special = /^(-?INF|NaN)$/.test(value);
      this.errors.push(`${describe(element)}: ${attribute}="${value}" ${special ? "must be a finite number for Mechweave" : "is not a number"}.`);
      return null;
    }
    return Number(value);
  }
}

/** `<species id="A">` or `<speciesReference species="A">`: how an element is named in messages. */
function describe(element: XmlElement): string {
  const key = element.attributes.id !== undefined ? "id" : element.attributes.species !== undefined ? "species" : null;
  return key ? `<${element.name} ${key}="${element.attributes[key]}">` : `A <${element.name}>`;
}
