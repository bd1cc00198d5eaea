// What to fit: the parameters to vary (each with optional bounds) and the chosen data sets; runs
// the fit on the server with its place in the queue, its iterations and falling cost, and cancel.
import { useState } from "react";
import type { FitResult } from "~/chem/fit/types";
import { MAX_FIT_PARAMETERS } from "~/chem/limits";
import { useDynamicsJob } from "~/components/dynamics/use-dynamics-job";
import { FitStatus } from "./fit-progress";

interface Props {
  mechanismId: string;
  /** Names a fit may vary: the text's parameters, then `[X]0` for each species. */
  candidates: string[];
  chosenDataSets: string[];
  onFinished(): void;
}

type Bounds = Record<string, { low?: number; high?: number }>;

export function FitForm({ mechanismId, candidates, chosenDataSets, onFinished }: Props) {
  const job = useDynamicsJob<FitResult & { id: string }>(`/api/v1/mechanisms/${mechanismId}/fits`);
  const [vary, setVary] = useState<string[]>([]);
  const [bounds, setBounds] = useState<Bounds>({});
  const toggle = (name: string, on: boolean) => setVary((current) => (on ? [...current, name].slice(0, MAX_FIT_PARAMETERS) : current.filter((each) => each !== name)));
  const setBound = (name: string, end: "low" | "high", text: string) =>
    setBounds((current) => ({ ...current, [name]: { ...current[name], [end]: text.trim() === "" ? undefined : Number(text) } }));

  async function run() {
    const chosenBounds = Object.fromEntries(vary.filter((name) => bounds[name]).map((name) => [name, bounds[name]]));
    await job.run({ dataSets: chosenDataSets, vary, bounds: chosenBounds });
    onFinished();
  }

  const ready = vary.length > 0 && chosenDataSets.length > 0;
  return (
    <section className="card p-4" data-testid="fit-form">
      <h3>Fit</h3>
      <p className="mt-1 text-xs text-muted">
        Weighted least squares (Levenberg–Marquardt) in log space on the chosen data sets; tick the parameters to estimate, and give bounds if you know them.
      </p>
      <div className="mt-3 max-h-56 overflow-auto rounded border border-line">
        <table className="w-full text-sm">
          <thead className="text-left text-xs uppercase tracking-wider text-muted">
            <tr><th className="px-2 py-1">Vary</th><th>Lower bound</th><th>Upper bound</th></tr>
          </thead>
          <tbody>
            {candidates.map((name) => (
              <tr key={name} className="border-t border-line">
                <td className="px-2 py-1">
                  <label className="flex items-center gap-2 font-mono">
                    <input type="checkbox" checked={vary.includes(name)} onChange={(e) => toggle(name, e.target.checked)} data-testid={`vary-${name}`} />
                    {name}
                  </label>
                </td>
                {(["low", "high"] as const).map((end) => (
                  <td key={end}>
                    <input
                      className="field w-28 py-0.5 text-xs"
                      type="number"
                      step="any"
                      min={0}
                      disabled={!vary.includes(name)}
                      aria-label={`${end === "low" ? "lower" : "upper"} bound of ${name}`}
                      value={bounds[name]?.[end] ?? ""}
                      onChange={(e) => setBound(name, end, e.target.value)}
                    />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="mt-3 flex flex-wrap items-center gap-3">
        {job.running ? (
          <button type="button" className="btn btn-danger" onClick={job.cancel}>Cancel</button>
        ) : (
          <button type="button" className="btn btn-primary" disabled={!ready} onClick={() => void run()} data-testid="run-fit">Run fit</button>
        )}
        <span className="text-xs text-muted">
          {vary.length} parameter{vary.length === 1 ? "" : "s"} · {chosenDataSets.length} data set{chosenDataSets.length === 1 ? "" : "s"}
          {!ready && " — tick at least one of each"}
        </span>
      </div>
      <FitStatus job={job} />
    </section>
  );
}
