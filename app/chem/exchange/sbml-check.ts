// The SBML Core rules Mechweave can check offline (see sbml-document.ts), plus that every
// kinetic law evaluates at positive concentrations and that a law declared as mass action
// (sboTerm SBO:0000012) really is one. Laws the file may define through rules or initial
// assignments cannot be evaluated here, and are reported as such.
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
