// The quantities a fit varies and a sensitivity run differentiates by, named as `--set` names
// them: a parameter of the text (`k1`, `T`: whatever rate coefficients, expressions and custom laws
// read) or an initial concentration (`[A]0`). A mechanism "at" given values is a copy with those
// values replaced; the network built from it folds them into the rate coefficients.

import { SimulationInputError } from "~/chem/kinetics/errors";
import type { Mechanism } from "~/chem/model";
import type { Settings } from "~/chem/parse";

export interface Parameter {
  /** As the caller wrote it: `k1` or `[A]0`. */
  name: string;
  kind: "parameter" | "initial";
  /** The parameter's or the species' name. */
  key: string;
}

const INITIAL = /^\[\s*(?:"([^"]+)"|([^\]\s]+))\s*\]0$/;

/** The species an initial-value name (`[A]0`, `["Fe3+"]0`) names; null for a parameter name. */
export function initialSpecies(name: string): string | null {
  const match = INITIAL.exec(name);
  return match ? (match[1] ?? match[2]) : null;
}

/** Reads parameter names against the mechanism; an unknown one is refused with its name. */
export function resolveParameters(mechanism: Mechanism, names: readonly string[]): Parameter[] {
  const seen = new Set<string>();
  return names.map((raw) => {
    const name = raw.trim();
    if (seen.has(name)) throw new SimulationInputError(`${name} is named twice`);
    seen.add(name);
    const species = initialSpecies(name);
    if (species !== null) {
      if (!mechanism.species.includes(species)) throw new SimulationInputError(`${name}: the mechanism has no species ${species} (fixed species cannot vary)`);
      return { name, kind: "initial", key: species };
    }
    if (!(name in mechanism.parameters)) {
      const known = Object.keys(mechanism.parameters);
      const hint = known.length ? `; its parameters are ${known.join(", ")}` : "; it has no named parameters";
      throw new SimulationInputError(`unknown parameter ${name}${hint}`);
    }
    return { name, kind: "parameter", key: name };
  });
}

/** Every parameter a rate coefficient names directly (`@ k1`), in order of appearance: the default to differentiate by. */
export function namedRateCoefficients(mechanism: Mechanism): string[] {
  const names = new Set<string>();
  for (const step of mechanism.steps) {
    for (const ref of [step.forward, step.backward]) if (ref?.kind === "parameter" && ref.name in mechanism.parameters) names.add(ref.name);
  }
  return [...names];
}

export function valueOf(mechanism: Mechanism, parameter: Parameter): number {
  return parameter.kind === "initial" ? (mechanism.initial[parameter.key] ?? 0) : mechanism.parameters[parameter.key];
}

/** The mechanism with settings applied (the CLI's `--set` after parsing). */
export function mechanismWith(mechanism: Mechanism, settings: Settings): Mechanism {
  return {
    ...mechanism,
    parameters: { ...mechanism.parameters, ...settings.parameters },
    initial: { ...mechanism.initial, ...settings.initial },
  };
}

/** The mechanism with the given values of the given parameters. */
export function mechanismAt(mechanism: Mechanism, parameters: readonly Parameter[], values: ArrayLike<number>): Mechanism {
  const settings: Settings = { parameters: {}, initial: {} };
  parameters.forEach((p, i) => (settings[p.kind === "initial" ? "initial" : "parameters"][p.key] = values[i]));
  return mechanismWith(mechanism, settings);
}

/** Checks that every name in the settings is a parameter or a (non-fixed) species of the mechanism. */
export function checkSettings(mechanism: Mechanism, settings: Settings, where: string): void {
  for (const name of Object.keys(settings.parameters)) {
    if (!(name in mechanism.parameters)) throw new SimulationInputError(`${where}: the mechanism has no parameter ${name}`);
  }
  for (const species of Object.keys(settings.initial)) {
    if (!mechanism.species.includes(species)) throw new SimulationInputError(`${where}: the mechanism has no species ${species}`);
  }
}
