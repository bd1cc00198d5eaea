// The Dynamics panel's stochastic choice: an ensemble of exact runs of the jump process on copy
// numbers (n = c·V), run on the server as jobs split over its workers, drawn as the band of mean ±
// one standard deviation per species with the first runs as thin lines.
import { useState } from "react";
import { parseMechanismWithSettings } from "~/chem/parse";
import type { StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { MAX_SERVER_SAMPLES, MAX_STOCHASTIC_RUNS } from "~/chem/limits";
import { readableNumberText, tickLabels } from "~/chem/numbers";
import type { Settings } from "~/chem/parse";
import { ensembleGeometry } from "./ensemble-chart";
import { JobStatus } from "./job-status";
import { seriesLook } from "./palette";
import { defaultVolume, startingCopies } from "./stochastic-volume";
import { useDynamicsJob } from "./use-dynamics-job";

interface Props {
  url: string;
  /** The text and overrides the run uses, read when it starts. */
  input: () => { source: string; overrides?: Settings };
  until: number;
}

export function StochasticCard({ url, input, until: panelUntil }: Props) {
  const job = useDynamicsJob<StochasticResult>(url);
  // The text's initial concentrations, read again whenever the reader comes back to the card.
  const readInitial = () => {
    const { source, overrides } = input();
    return parseMechanismWithSettings(source, overrides ?? { parameters: {}, initial: {} }).mechanism.initial;
  };
  const [initial, setInitial] = useState(readInitial);
  // null: the volume follows the initial concentrations until the reader types one.
  const [chosenVolume, setVolume] = useState<number | null>(null);
  const volume = chosenVolume ?? defaultVolume(initial);
  const [runs, setRuns] = useState(200);
  const [seed, setSeed] = useState(1);
  const [until, setUntil] = useState(panelUntil);
  const field = (label: string, value: number, set: (v: number) => void, bounds: { min?: number; max?: number; step?: string } = {}) => (
    <label className="text-sm">
      <span className="label">{label}</span>
      <input className="field w-28 py-1.5" type="number" step={bounds.step ?? "any"} min={bounds.min} max={bounds.max} value={value} onChange={(e) => set(Number(e.target.value))} required />
    </label>
  );
  return (
    <section className="card p-4" data-testid="stochastic">
      <h3>Stochastic runs</h3>
      <form
        className="mt-2 flex flex-wrap items-end gap-3"
        onFocus={() => setInitial(readInitial())}
        onSubmit={(e) => {
          e.preventDefault();
          const now = readInitial();
          setInitial(now);
          void job.run({ kind: "stochastic", ...input(), settings: { until, samples: 200, volume: chosenVolume ?? defaultVolume(now), runs, seed } });
        }}
      >
        {field("Volume V", volume, setVolume, { min: 1e-12 })}
        {field("Runs", runs, (v) => setRuns(Math.round(v)), { min: 1, max: MAX_STOCHASTIC_RUNS, step: "1" })}
        {field("Seed", seed, (v) => setSeed(Math.round(v)), { min: 0, step: "1" })}
        {field("Until time", until, setUntil, { min: 1e-9 })}
        {job.running ? (
          <button type="button" className="btn btn-danger" onClick={job.cancel}>Cancel</button>
        ) : (
          <button type="submit" className="btn">Run</button>
        )}
      </form>
      <StartingCopies initial={initial} volume={volume} chosen={chosenVolume !== null} />
      <p className="mt-1 text-xs text-muted">
        Each run is exact (Gillespie&apos;s direct method, or Gibson–Bruck&apos;s next reaction method for large networks) and starts from
        n = round(c·V) copies; mass-action steps only. The same seed gives the same runs.
      </p>
      <JobStatus job={job} />
      {job.result && <EnsembleChart result={job.result} />}
    </section>
  );
}

/** How many copies of each species the volume means, scarcest first, so an empty run is seen before it starts. */
function StartingCopies({ initial, volume, chosen }: { initial: Record<string, number>; volume: number; chosen: boolean }) {
  const copies = startingCopies(initial, volume)
    .filter(([, n]) => n > 0)
    .sort(([, a], [, b]) => a - b);
  const lost = Object.entries(initial).filter(([name, c]) => c > 0 && !copies.some(([present]) => present === name));
  const shown = 12;
  return (
    <p className="mt-2 text-xs" data-testid="starting-copies">
      <span className="text-muted">{chosen ? "At this volume" : `Volume ${readableNumberText(volume)}, chosen from the initial concentrations`}, the runs start with </span>
      {copies.length === 0 ? (
        <span>no molecules at all</span>
      ) : (
        <span className="font-mono">
          {copies.slice(0, shown).map(([name, n]) => `${name} ${readableNumberText(n)}`).join(", ")}
          {copies.length > shown ? ` and ${copies.length - shown} more species` : ""}
        </span>
      )}
      {lost.length > 0 && <span className="text-signal"> ({lost.map(([name]) => name).join(", ")} round{lost.length === 1 ? "s" : ""} to 0 copies)</span>}
      <span className="text-muted">.</span>
    </p>
  );
}

const box = { left: 64, top: 10, width: 640, height: 240 };

function EnsembleChart({ result }: { result: StochasticResult }) {
  const names = Object.keys(result.mean);
  const [hidden, setHidden] = useState<ReadonlySet<string>>(new Set());
  const shown = names.filter((name) => !hidden.has(name));
  const { x, y, shapes } = ensembleGeometry(result, shown, box);
  const px = (t: number) => box.left + ((t - x.min) / (x.max - x.min || 1)) * box.width;
  const py = (n: number) => box.top + box.height - ((n - y.min) / (y.max - y.min || 1)) * box.height;
  const look = (name: string) => seriesLook(names.indexOf(name));
  const { runs, events, method, volume } = result.stats;
  return (
    <figure className="mt-3 space-y-2">
      <svg viewBox={`0 0 ${box.left + box.width + 12} ${box.top + box.height + 44}`} className="w-full" role="img" aria-label="Mean copy numbers with a band of one standard deviation, and sample runs" data-testid="ensemble-chart">
        <g className="text-muted" fill="currentColor" fontSize="11">
          {y.ticks.map((tick, i) => (
            <g key={`y${tick}`}>
              <line x1={box.left} x2={box.left + box.width} y1={py(tick)} y2={py(tick)} stroke="var(--mw-line)" />
              <text x={box.left - 6} y={py(tick) + 4} textAnchor="end">{tickLabels(y.ticks)[i]}</text>
            </g>
          ))}
          {x.ticks.map((tick, i) => (
            <text key={`x${tick}`} x={px(tick)} y={box.top + box.height + 16} textAnchor="middle">{tickLabels(x.ticks)[i]}</text>
          ))}
          <text x={box.left + box.width / 2} y={box.top + box.height + 36} textAnchor="middle">time</text>
          <text transform={`translate(14 ${box.top + box.height / 2}) rotate(-90)`} textAnchor="middle">copies</text>
        </g>
        {shapes.map((shape) => (
          <g key={shape.name} stroke={look(shape.name).colour} fill="none">
            <path d={shape.band} fill={look(shape.name).colour} fillOpacity={0.16} stroke="none" />
            {shape.paths.map((d, i) => <path key={i} d={d} strokeWidth={1} strokeOpacity={0.6} strokeDasharray={["", "4 3", "1 3"][i % 3] || undefined} />)}
            <path d={shape.mean} strokeWidth={2.2} />
          </g>
        ))}
      </svg>
      <figcaption className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs">
        {names.map((name) => (
          <label key={name} className="inline-flex cursor-pointer items-center gap-1">
            <input type="checkbox" className="sr-only" checked={!hidden.has(name)} onChange={() => setHidden(toggled(hidden, name))} />
            <svg width="24" height="10" aria-hidden="true" style={{ opacity: hidden.has(name) ? 0.3 : 1 }}>
              <rect x="0" y="1" width="24" height="8" fill={look(name).colour} fillOpacity={0.16} />
              <line x1="0" y1="5" x2="24" y2="5" stroke={look(name).colour} strokeWidth="2" />
            </svg>
            <span className={hidden.has(name) ? "text-muted line-through" : ""}>{name}</span>
          </label>
        ))}
      </figcaption>
      <p className="text-xs text-muted">
        Band: mean ± one standard deviation over {runs} runs; thin lines: runs {result.paths.map((_, i) => i + 1).join(", ")}. Volume {readableNumberText(volume)}{" "}
        (divide copies by it for concentrations); {events.toLocaleString("en")} events, {method === "direct" ? "direct method" : "next reaction method"}.
      </p>
    </figure>
  );
}

function toggled(set: ReadonlySet<string>, name: string): ReadonlySet<string> {
  const next = new Set(set);
  if (!next.delete(name)) next.add(name);
  return next;
}
