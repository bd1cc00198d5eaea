// Extra candidate complexes written as in the mechanism language (`2y`, `x + y`, `0`), read by the
// language's own parser so that complexes mean the same everywhere: each is read as the left side
// of a step to a placeholder species that no ODE variable can be named.
import { parseMechanism } from "../parse";
import { RealizeRequestError } from "./request-error";

const PLACEHOLDER = "candidate complex";

export function readComplexes(texts: readonly string[], species: readonly string[]): number[][] {
  return texts.map((text) => {
    const { mechanism, diagnostics } = parseMechanism(`${text} -> "${PLACEHOLDER}"`);
    const error = diagnostics.find((d) => d.severity === "error");
    if (error || mechanism.steps.length !== 1) throw new RealizeRequestError(`cannot read the complex "${text}"${error ? `: ${error.message}` : ""}`);
    const vector = species.map(() => 0);
    for (const { species: name, coefficient } of mechanism.steps[0].reactants) {
      const index = species.indexOf(name);
      if (index < 0) throw new RealizeRequestError(`the complex "${text}" names ${name}, which is not a variable of the ODE`);
      vector[index] += coefficient;
    }
    return vector;
  });
}
