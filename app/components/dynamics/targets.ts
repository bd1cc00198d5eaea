// What a sweep or a continuation can vary, as "kind:name" choices read off the text, and the
// choice as the job's target and as an axis label.
import { rateValue } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";
import { mechanismNames } from "~/editor/complete";
import type { ContinuationTarget } from "~/shared/job-schemas";

/**
 * Initial values, parameters, held species, and each labelled mass-action step's coefficient (a
 * reversible step's backward one as "step:LABEL:backward").
 */
export function sweepTargets(source: string, species: string[]): string[] {
  const { mechanism } = parseMechanism(source);
  const steps = mechanism.steps.filter((step) => step.label !== null && step.law === null);
  return [
    ...species.map((name) => `initial:${name}`),
    ...mechanismNames(source).parameters.map((name) => `parameter:${name}`),
    ...Object.keys(mechanism.fixed).map((name) => `fixed:${name}`),
    ...steps.flatMap((step) => (step.reversible ? [`step:${step.label}`, `step:${step.label}:backward`] : [`step:${step.label}`])),
  ];
}

export function sweepTarget(choice: string): ContinuationTarget {
  const [kind, name, direction] = choice.split(":");
  if (kind === "initial" || kind === "fixed") return { kind, species: name };
  if (kind === "step") return { kind, label: name, direction: direction === "backward" ? "backward" : "forward" };
  return { kind: "parameter", name };
}

/** "parameter:k1" → "k1", "initial:S" → "[S]0", "fixed:B" → "[B]", "step:r2:backward" → "k of r2 (backward)": the varied quantity as a chart names it. */
export function sweepTargetLabel(target: string): string {
  const [kind, name, direction] = target.split(":");
  if (kind === "initial") return `[${name}]0`;
  if (kind === "fixed") return `[${name}]`;
  if (kind === "step") return direction === "backward" ? `k of ${name} (backward)` : `k of ${name}`;
  return name ?? target;
}

/** The value the text gives each choice of `sweepTargets` (a species without an initial value starts at 0); a choice with no number is left out. */
export function targetValues(source: string): Map<string, number> {
  const { mechanism } = parseMechanism(source);
  const values = new Map<string, number>();
  for (const name of mechanism.species) values.set(`initial:${name}`, mechanism.initial[name] ?? 0);
  for (const [name, value] of Object.entries(mechanism.parameters)) values.set(`parameter:${name}`, value);
  for (const [name, value] of Object.entries(mechanism.fixed)) values.set(`fixed:${name}`, value);
  for (const step of mechanism.steps) {
    if (step.label === null || step.law !== null) continue;
    const forward = step.forward && rateValue(step.forward, mechanism);
    const backward = step.reversible && step.backward ? rateValue(step.backward, mechanism) : null;
    if (forward !== null) values.set(`step:${step.label}`, forward);
    if (backward !== null) values.set(`step:${step.label}:backward`, backward);
  }
  return values;
}

/**
 * Where a sweep over a quantity starts when the reader has not said: a decade either side of its
 * value, else 0.5 … 5. A parameter named T is a temperature by the trade's convention, and a
 * decade either side of one (110 … 11000 K) is no range a chemist would look at: it gets a quarter
 * either side instead (common practice, no source).
 */
export function defaultSweepRange(value: number | undefined, target = ""): { from: number; to: number } {
  if (value === undefined || !(value > 0) || !Number.isFinite(value)) return { from: 0.5, to: 5 };
  const [low, high] = target === "parameter:T" ? [0.75, 1.25] : [0.1, 10];
  return { from: Number((value * low).toPrecision(12)), to: Number((value * high).toPrecision(12)) };
}
