// The Dynamics panel's continuation: one branch of equilibria followed in a chosen quantity on the
// server, drawn as a bifurcation diagram of a chosen species.
import { useState } from "react";
import type { ContinuationResult } from "~/chem/kinetics/continuation";
import type { JobInput } from "../dynamics-tab";
import { BifurcationDiagram } from "./bifurcation-diagram";
import { JobStatus } from "./job-status";
import { NumberField } from "./number-field";
import { sweepTarget, sweepTargetLabel } from "./targets";
import { useDynamicsJob } from "./use-dynamics-job";
import { useVariedQuantity } from "./use-varied-quantity";

interface Props {
  /** The endpoint that runs the panel's jobs. */
  url: string;
  text: () => string;
  input: JobInput;
  species: string[];
}

export function ContinuationCard({ url, text, input, species }: Props) {
  const job = useDynamicsJob<ContinuationResult>(url);
  const [shown, setShown] = useState("");
  const varied = useVariedQuantity(text, species);
  const { chosen: chosenTarget, from, to } = varied;
  // The target the result was computed for labels its axis, not what the field says now.
  const [ranFor, setRanFor] = useState("");
  const result = job.result;
  const names = result ? Object.keys(result.points[0]?.state ?? {}) : species;
  const chosenSpecies = names.includes(shown) ? shown : result ? mostChanging(result) : (names[0] ?? "");

  function start() {
    setRanFor(chosenTarget);
    void job.run({ kind: "continuation", ...input(), options: { target: sweepTarget(chosenTarget), from, to } });
  }

  return (
    <section className="card p-4" data-testid="continuation">
      <h3>Bifurcation diagram</h3>
      <div className="mt-2 flex flex-wrap items-end gap-3 text-sm">
        <label>
          <span className="label">Follow equilibria in</span>
          <input
            className="field w-44 py-1.5"
            list="continuation-targets"
            value={chosenTarget}
            onChange={(e) => varied.choose(e.target.value)}
            onFocus={varied.reread}
            placeholder="fixed:B or parameter:k"
            aria-label="Quantity to vary"
          />
          <datalist id="continuation-targets">{varied.targets.map((t) => <option key={t} value={t} />)}</datalist>
        </label>
        <NumberField label="From" value={from} onChange={(value) => varied.setRange({ from: value })} min={0} />
        <NumberField label="To" value={to} onChange={(value) => varied.setRange({ to: value })} min={0} />
        {job.running ? <button className="btn btn-danger" onClick={job.cancel}>Cancel</button> : <button className="btn" onClick={start} disabled={!chosenTarget}>Follow</button>}
        {names.length > 1 && (
          <label>
            <span className="label">Show</span>
            <select className="field py-1.5" value={chosenSpecies} onChange={(e) => setShown(e.target.value)} aria-label="Species shown">
              {names.map((name) => <option key={name}>{name}</option>)}
            </select>
          </label>
        )}
      </div>
      <p className="mt-1 text-xs text-muted">
        Starts from an equilibrium at the first value and follows it by arclength, round folds, in the compatibility class of the initial state;
        each point&apos;s stability comes from its eigenvalues. Varying an initial concentration (initial:NAME) changes the class&apos;s totals.
      </p>
      <JobStatus job={job} />
      {result && (
        <div className="mt-3 space-y-2">
          <p className="text-sm">{result.summary}</p>
          <BifurcationDiagram result={result} species={chosenSpecies} xLabel={sweepTargetLabel(ranFor || chosenTarget)} />
          <p className="text-xs text-muted" role="note">
            A diagram of the model as written, not of the laboratory: it does not replace experimental hazard assessment, local rules or licensed practice.
          </p>
        </div>
      )}
    </section>
  );
}

/** The species whose equilibrium value changes most along the branch, relative to its size: the one worth showing first. */
export function mostChanging(result: ContinuationResult): string {
  const names = Object.keys(result.points[0]?.state ?? {});
  const change = (name: string) => {
    const values = result.points.map((p) => p.state[name]);
    const [low, high] = [Math.min(...values), Math.max(...values)];
    return (high - low) / (Math.max(Math.abs(low), Math.abs(high)) || 1);
  };
  return names.reduce((best, name) => (change(name) > change(best) ? name : best), names[0] ?? "");
}
