// `mechweave continue FILE --vary NAME --from A --to B [--points N] [--set …] [--json]` →
// { "points": [{ "value", "state", "stable" }], "bifurcations": [{ "kind", "value", "state" }], … }.
// NAME is a parameter (`k4`), a step's label (`r2`, or `r2:backward` for its reverse coefficient),
// a held species (`[B]`) or an initial concentration (`[X]0`, which sets a total).
// With `--vary2 NAME2 --from2 A2 --to2 B2 --steps N` one branch is continued at each of N values of
// NAME2 → { "values", "bifurcations": [{ "kind", "value", "second", "state" }] }: the fold and Hopf
// curves sampled in both parameters.

import type { BifurcationSweepResult } from "~/chem/kinetics/bifurcation-sweep";
import type { ContinuationResult } from "~/chem/kinetics/continuation";
import type { Mechanism } from "~/chem/model";
import { continuationSettings, type ContinuationTarget } from "~/shared/job-schemas";
import { runJob } from "../sim/job";
import { runModelCommand } from "./simulate";
import { checkedSettings, UsageError } from "./usage";

export function run(args: string[]): Promise<number> {
  return runModelCommand(
    "continue",
    args,
    { vary: "text", from: "number", to: "number", points: "integer", vary2: "text", from2: "number", to2: "number", steps: "integer" },
    (model, flags) => {
      for (const required of ["vary", "from", "to"]) if (flags[required] === undefined) throw new UsageError(`--${required} is required`);
      if (model.kind !== "mechanism") throw new UsageError("continue follows a .weave mechanism's equilibria; FILE is a .ode system");
      const options = checkedSettings(continuationSettings, {
        target: targetNamed(model.mechanism, flags.vary as string),
        from: flags.from,
        to: flags.to,
        maxPoints: flags.points,
        second: flags.vary2 === undefined ? undefined : { target: targetNamed(model.mechanism, flags.vary2 as string), from: flags.from2, to: flags.to2, steps: flags.steps ?? 11 },
      });
      return runJob({ kind: "continuation", model, options });
    },
    (result: ContinuationResult | BifurcationSweepResult) => {
      if ("values" in result) {
        const rows = result.bifurcations.map((b) => [b.second.toPrecision(6), b.kind, b.value.toPrecision(8)].join("\t"));
        return [["second", "kind", "value"].join("\t"), ...rows, `# ${result.summary}`].join("\n");
      }
      const names = Object.keys(result.points[0]?.state ?? {});
      const stability = (stable: boolean | null) => (stable === null ? "undecided" : stable ? "stable" : "unstable");
      const rows = result.points.map((p) => [p.value, ...names.map((name) => p.state[name])].map((x) => x.toPrecision(6)).concat(stability(p.stable)).join("\t"));
      const found = result.bifurcations.map((b) => `# ${b.kind} at ${b.value.toPrecision(8)}: ${names.map((name) => `${name} = ${b.state[name].toPrecision(6)}`).join(", ")}`);
      return [["value", ...names, "stability"].join("\t"), ...rows, ...found, `# ${result.summary}`].join("\n");
    },
  );
}

/** What `--vary NAME` names in this mechanism. */
function targetNamed(mechanism: Mechanism, name: string): ContinuationTarget {
  const bracketed = /^\[\s*"?([^"\]]+?)"?\s*\](0?)$/.exec(name.trim());
  if (bracketed) {
    const [, species, initial] = bracketed;
    if (initial) return { kind: "initial", species };
    if (species in mechanism.fixed) return { kind: "fixed", species };
    throw new UsageError(`--vary ${name}: ${species} is not a held species; write [${species}]0 to vary its initial concentration`);
  }
  if (name in mechanism.parameters) return { kind: "parameter", name };
  const [label, direction] = name.split(":");
  if (mechanism.steps.some((step) => step.label === label) && (direction === undefined || direction === "backward")) {
    return direction ? { kind: "step", label, direction } : { kind: "step", label };
  }
  throw new UsageError(`--vary ${name}: not a parameter, a step label (LABEL or LABEL:backward), a held species ([B]) or an initial concentration ([X]0) of the mechanism`);
}
