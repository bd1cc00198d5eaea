// Fold and Hopf points in two parameters, by sweeping the second: at each of its values one
// branch is continued in the first (continuation.ts) and its folds and Hopf points are recorded
// with that value. Plotted against both parameters, they trace the fold and Hopf curves — the
// edges of the regions of bistability and of oscillation — without continuing the curves
// themselves, so a curve is sampled at the grid's values only, and only where it crosses the
// branch that each continuation follows.

import type { Mechanism } from "~/chem/model";
import type { ContinuationTarget } from "~/shared/job-schemas";
import { continueEquilibria, type Bifurcation, type ContinuationOptions } from "./continuation";
import { SimulationCancelled } from "./errors";
import { sweepValues, variedMechanism } from "./sweep";

export interface SecondParameter {
  target: ContinuationTarget;
  from: number;
  to: number;
  /** Values of the second parameter, spaced evenly from `from` to `to`. */
  steps: number;
}

export interface BifurcationSweepResult {
  /** The second parameter's values. */
  values: number[];
  /** Every fold and Hopf point found, with the second parameter's value it was found at. */
  bifurcations: (Bifurcation & { second: number })[];
  summary: string;
}

export function sweepBifurcations(mechanism: Mechanism, options: ContinuationOptions & { second: SecondParameter }): BifurcationSweepResult {
  const { second, onProgress, ...first } = options;
  const values = sweepValues(second.from, second.to, second.steps, "linear");
  const at = variedMechanism(second.target, mechanism);
  const bifurcations = values.flatMap((value, i) => {
    if (options.signal?.aborted) throw new SimulationCancelled();
    const found = continueEquilibria(at(value), first).bifurcations.map((b) => ({ ...b, second: value }));
    onProgress?.((i + 1) / values.length);
    return found;
  });
  const counted = (kind: Bifurcation["kind"]) => bifurcations.filter((b) => b.kind === kind).length;
  return {
    values,
    bifurcations,
    summary: `${values.length} branches continued, one at each value of the second parameter: ${counted("fold")} fold and ${counted("hopf")} Hopf points in all.`,
  };
}
