// Which parameters matter: normalized sensitivities ∂ln x/∂ln p over a run, as a heat map
// (species × parameter, the signed peak over the run) and as curves for one species; and the
// rates of production of one species at one time, step by step, as a ranked bar chart.
import { useMemo, useState } from "react";
import type { SensitivityResult } from "~/chem/fit/types";
import { buildNetwork } from "~/chem/network";
import { readableNumberText } from "~/chem/numbers";
import { parseMechanism } from "~/chem/parse";
import { chartSvg } from "~/components/dynamics/chart-svg";
import { JobStatus } from "~/components/dynamics/job-status";
import { useDynamicsJob } from "~/components/dynamics/use-dynamics-job";
import { currentThemeColours } from "~/utils/graph-svg";
import { cellInk, divergingColour } from "./colour-scale";
import { peakSensitivities, sensitivityPicture } from "./fit-charts";
import { RatesOfProductionChart } from "./rates-chart";

interface Props {
  mechanismId: string;
  /** The text the rates of production are computed on (the one the run used). */
  source: () => string;
}

export function SensitivityCard({ mechanismId, source }: Props) {
  const job = useDynamicsJob<SensitivityResult>(`/api/v1/mechanisms/${mechanismId}/sensitivities`);
  const [until, setUntil] = useState(50);
  const [samples, setSamples] = useState(200);
  const [ranOn, setRanOn] = useState("");
  const result = job.result;

  return (
    <section className="card p-4" data-testid="sensitivities">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h3>Sensitivities and rates of production</h3>
        <div className="flex flex-wrap items-end gap-2">
          <label className="text-sm"><span className="label">Until time</span><input className="field w-24 py-1" type="number" step="any" min={0} value={until} onChange={(e) => setUntil(Number(e.target.value))} /></label>
          <label className="text-sm"><span className="label">Samples</span><input className="field w-20 py-1" type="number" min={2} value={samples} onChange={(e) => setSamples(Math.round(Number(e.target.value)))} /></label>
          {job.running ? (
            <button type="button" className="btn btn-danger" onClick={job.cancel}>Cancel</button>
          ) : (
            <button type="button" className="btn" onClick={() => { setRanOn(source()); void job.run({ until, samples }); }} data-testid="run-sensitivities">Compute</button>
          )}
        </div>
      </div>
      <JobStatus job={job} />
      {result && <SensitivityViews result={result} source={ranOn} />}
    </section>
  );
}

function SensitivityViews({ result, source }: { result: SensitivityResult; source: string }) {
  const model = useMemo(() => {
    const { mechanism } = parseMechanism(source);
    return { mechanism, network: buildNetwork(mechanism) };
  }, [source]);
  // Rows in the order the text names the species.
  const species = useMemo(() => {
    const named = model.mechanism.species.filter((name) => name in result.normalized);
    return [...named, ...Object.keys(result.normalized).filter((name) => !named.includes(name))];
  }, [model, result]);
  const [chosen, setChosen] = useState(species[0] ?? "");
  const [timeIndex, setTimeIndex] = useState(result.t.length - 1);
  const peaks = useMemo(() => peakSensitivities(result), [result]);
  // Colours are relative to the largest magnitude in the table: sensitivities are often well above 1.
  const largest = useMemo(() => Math.max(1e-12, ...Object.values(peaks).flatMap((row) => Object.values(row).map((v) => Math.abs(v ?? 0)))), [peaks]);
  const shown = species.includes(chosen) ? chosen : species[0];
  const svg = useMemo(() => (shown ? chartSvg(sensitivityPicture(result, shown), currentThemeColours()) : ""), [result, shown]);
  const index = Math.min(timeIndex, result.t.length - 1);
  return (
    <>
      <h4 className="mt-4 text-sm font-medium">Largest ∂ln x/∂ln p over the run</h4>
      <div className="mt-2 overflow-x-auto">
        <table className="border-separate border-spacing-0.5 text-xs" data-testid="sensitivity-heatmap">
          <thead>
            <tr><th />{result.parameters.map((p) => <th key={p} className="px-1 font-mono font-normal text-muted">{p}</th>)}</tr>
          </thead>
          <tbody>
            {species.map((name) => (
              <tr key={name}>
                <th className={`pr-2 text-right font-mono font-normal ${name === shown ? "text-ink" : "text-muted"}`}>
                  <button type="button" onClick={() => setChosen(name)}>{name}</button>
                </th>
                {result.parameters.map((p) => {
                  const value = peaks[name]?.[p] ?? null;
                  return (
                    <td key={p} className="min-w-12 rounded px-1 py-1 text-center tabular-nums" style={{ background: value === null ? "transparent" : divergingColour(value / largest), color: value === null ? "inherit" : cellInk(value / largest) }} title={`${name} × ${p}`}>
                      {value === null ? "—" : value.toFixed(2)}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-1 text-xs text-muted">Teal: raising the parameter lowers the concentration; copper: raises it; the stronger the colour, the closer to the largest value in the table. Click a species for its curves.</p>
      <h4 className="mt-4 text-sm font-medium">Sensitivities of {shown} over time</h4>
      <div className="mt-2 overflow-x-auto" data-testid="sensitivity-curves" dangerouslySetInnerHTML={{ __html: svg }} />
      <div className="mt-4 flex flex-wrap items-center gap-3">
        <h4 className="text-sm font-medium">Rates of production of {shown} at t = {readableNumberText(result.t[index])}</h4>
        <input type="range" min={0} max={result.t.length - 1} value={index} onChange={(e) => setTimeIndex(Number(e.target.value))} aria-label="time" className="w-48" />
      </div>
      <RatesOfProductionChart model={model} result={result} species={shown} index={index} />
    </>
  );
}
