// The SBML Core rules Mechweave can check offline (see sbml-document.ts), plus that every name a
// kinetic law uses has a value, so that the law can be evaluated, and that a law declared as mass
// action (sboTerm SBO:0000012) really is one: equal to kf·x^reactants (− kb·x^products) with
// kf, kb ≥ 0 at random positive concentrations. Values the file sets through rules or initial
// assignments are not read, so a law that depends on them is reported as not evaluable. Also SBML
// Level 3 Core's rule that every species a kinetic law names is a reactant, product or modifier of
// its reaction (the one our exports once broke: libSBML refuses such a file).
import { isSymbolNode } from "mathjs";
import { KineticLawReader } from "./kinetic-law";
import { massActionSboTerm, readSbml } from "./sbml-document";

/** Problems with an SBML document, each a sentence; empty when it passes. */
export function checkSbml(xml: string): string[] {
  const reading = readSbml(xml);
  if (!reading.ok) return reading.errors;
  const { model } = reading;
  const laws = new KineticLawReader(model);
  const errors: string[] = [];
  const speciesIds = new Set(model.species.map((each) => each.id));
  for (const reaction of model.reactions) {
    if (!reaction.law?.math) continue;
    const listed = new Set([...reaction.reactants.map((each) => each.species), ...reaction.products.map((each) => each.species), ...reaction.modifiers]);
    const unlisted = new Set<string>();
    reaction.law.math.traverse((node, path) => {
      if (isSymbolNode(node) && path !== "fn" && speciesIds.has(node.name) && !reaction.law!.localParameters.has(node.name) && !listed.has(node.name)) unlisted.add(node.name);
    });
    for (const id of unlisted) {
      errors.push(`The kinetic law of reaction ${reaction.id} uses species ${id}, which is not a reactant, product or modifier of the reaction.`);
    }
    if (reaction.law.sboTerm === massActionSboTerm) {
      const mismatch = laws.massActionMismatch(reaction);
      if (mismatch) errors.push(`The kinetic law of reaction ${reaction.id} is declared mass action (${massActionSboTerm}), but ${mismatch}.`);
      continue;
    }
    const law = laws.read(reaction);
    if (law.kind === "unevaluable") errors.push(`The kinetic law of reaction ${reaction.id} cannot be evaluated: ${law.reason}.`);
  }
  return errors;
}
