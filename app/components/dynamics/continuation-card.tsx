// The Dynamics panel's continuation: one branch of equilibria followed in a chosen quantity on the
// server, drawn as a bifurcation diagram of a chosen species.
import { useState } from "react";
import type { ContinuationResult } from "~/chem/kinetics/continuation";
import type { JobInput } from "../dynamics-tab";
import { BifurcationDiagram } from "./bifurcation-diagram";
import { JobStatus } from "./job-status";
import { NumberField } from "./number-field";
import { defaultSweepRange, sweepTarget, sweepTargetLabel, sweepTargets, targetValues } from "./targets";
import { useDynamicsJob } from "./use-dynamics-job";

interface Props {
  /** The endpoint that runs the panel's jobs. */
  url: string;
  text: () => string;
  input: JobInput;
  species: string[];
}

export function ContinuationCard({ url, text, input, species }: Props) {
  const job = useDynamicsJob<ContinuationResult>(url);
  const [target, setTarget] = useState("");
  const [shown, setShown] = useState("");
  const [targets, setTargets] = useState<string[]>(() => sweepTargets(text(), species));
  const [values, setValues] = useState(() => targetValues(text()));
  // A range the reader typed holds for the quantity it was typed for; any other starts a decade either side of its value.
  const [typedRange, setTypedRange] = useState<{ target: string; from: number; to: number } | null>(null);
  // The target the result was computed for labels its axis, not what the field says now.
  const [ranFor, setRanFor] = useState("");
  // A held species or a parameter is the usual thing to vary; an initial amount (a total) otherwise.
  const chosenTarget = target || targets.find((t) => !t.startsWith("initial:")) || targets[0] || "";
  const { from, to } = typedRange?.target === chosenTarget ? typedRange : defaultSweepRange(values.get(chosenTarget));
  const setRange = (change: { from?: number; to?: number }) => setTypedRange({ target: chosenTarget, from, to, ...change });
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
            onChange={(e) => setTarget(e.target.value)}
            onFocus={() => {
              setTargets(sweepTargets(text(), species));
              setValues(targetValues(text()));
            }}
            placeholder="fixed:B or parameter:k"
            aria-label="Quantity to vary"
          />
          <datalist id="continuation-targets">{targets.map((t) => <option key={t} value={t} />)}</datalist>
        </label>
        <NumberField label="From" value={from} onChange={(value) => setRange({ from: value })} min={0} />
        <NumberField label="To" value={to} onChange={(value) => setRange({ to: value })} min={0} />
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
