// What a sweep or a continuation can vary, as "kind:name" choices read off the text, and the
// choice as the job's target and as an axis label.
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
