// What the editor reads from its text (diagnostics, the names to complete), worked out from the
// shared parser. Pure functions: the reading worker runs them off the page's main thread, the
// tests call them directly.
import type { Diagnostic } from "@codemirror/lint";
import type { ParseResult } from "~/chem/model";
import { rateExpressionParameters } from "~/chem/rate-expression";

export interface MechanismNames {
  species: string[];
  fixed: string[];
  parameters: string[];
}

/** The parser's messages, offsets and severities, clipped to the text. */
export function diagnosticsOf({ diagnostics }: ParseResult, source: string): Diagnostic[] {
  return diagnostics.map(({ from, to, severity, message }) => ({
    from: Math.min(from, source.length),
    to: Math.min(Math.max(to, from), source.length),
    severity,
    message,
  }));
}

/** Species, fixed species and parameter names (declared or only used), each once, in text order. */
export function namesOf({ mechanism }: ParseResult): MechanismNames {
  const parameters = new Set(Object.keys(mechanism.parameters));
  for (const step of mechanism.steps) {
    for (const rate of [step.forward, step.backward]) {
      if (rate?.kind === "parameter") parameters.add(rate.name);
      if (rate?.kind === "expression") for (const name of rateExpressionParameters(rate.expression)) parameters.add(name);
    }
  }
  return { species: mechanism.species, fixed: Object.keys(mechanism.fixed), parameters: [...parameters] };
}
