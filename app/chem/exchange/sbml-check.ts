// The SBML Core rules Mechweave can check offline (see sbml-document.ts), plus that every name a
// kinetic law uses has a value, so that the law can be evaluated, and that a law declared as mass
// action (sboTerm SBO:0000012) really is one: equal to kf·x^reactants (− kb·x^products) with
// kf, kb ≥ 0 at random positive concentrations. Values the file sets through rules or initial
// assignments are not read, so a law that depends on them is reported as not evaluable.
import { KineticLawReader } from "./kinetic-law";
import { massActionSboTerm, readSbml } from "./sbml-document";

/** Problems with an SBML document, each a sentence; empty when it passes. */
export function checkSbml(xml: string): string[] {
  const reading = readSbml(xml);
  if (!reading.ok) return reading.errors;
  const { model } = reading;
  const laws = new KineticLawReader(model);
  const errors: string[] = [];
  for (const reaction of model.reactions) {
    if (!reaction.law?.math) continue;
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
