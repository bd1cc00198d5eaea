// The Dynamics panel: time courses of the live text, with progress and cancel, measured data
// overlaid with residuals, a phase portrait, equilibrium and stability, the largest Lyapunov
// exponent, and one-parameter sweeps. Every run happens on the server, in a worker thread, on the
// text with the panel's overrides (`T=1100`, `[A]0=2e-3`) in place of the values it declares.
import { useMemo, useState } from "react";
import type * as Y from "yjs";
import type { RoomReport } from "~/shared/analysis-map";
import { CsvError, readMeasuredCsv, residuals, simulationCsv, type MeasuredCourses } from "~/chem/kinetics/csv";
import type { EquilibriumResult } from "~/chem/kinetics/equilibrium";
import type { Method } from "~/chem/kinetics/integrator";
import type { LyapunovResult } from "~/chem/kinetics/lyapunov";
import { METHOD_NAMES } from "~/chem/kinetics/settings";
import type { SimulationResult } from "~/chem/kinetics/simulate";
import { readableNumberText } from "~/chem/numbers";
import type { SweepResult } from "~/chem/kinetics/sweep";
import { MAX_SERVER_SAMPLES, MAX_SERVER_SWEEP_POINTS } from "~/chem/limits";
import { readOverrides } from "~/chem/overrides";
import type { Settings } from "~/chem/parse";
import { PhasePortrait } from "./dynamics/phase-portrait";
import { TimeCourseChart } from "./dynamics/time-course-chart";
import { EquilibriumList } from "./dynamics/equilibria";
import { JobStatus } from "./dynamics/job-status";
import { StochasticCard } from "./dynamics/stochastic-card";
import { useDynamicsJob } from "./dynamics/use-dynamics-job";
import { NumberField } from "./dynamics/number-field";
import { sweepTarget, sweepTargetLabel } from "./dynamics/targets";
import { useVariedQuantity } from "./dynamics/use-varied-quantity";
import { ContinuationCard } from "./dynamics/continuation-card";

const dynamicsUrl = (mechanismId: string) => `/api/v1/mechanisms/${mechanismId}/dynamics`;

/** The text and overrides every job of the panel runs on. */
export type JobInput = () => { source: string; overrides?: Settings };

interface Props {
  mechanismId: string;
  source: Y.Text | null;
  report: RoomReport | null;
}

export function DynamicsTab({ mechanismId, source, report }: Props) {
  const text = () => source?.toString() ?? "";
  const simulation = useDynamicsJob<SimulationResult>(dynamicsUrl(mechanismId));
  const [until, setUntil] = useState(50);
  const [samples, setSamples] = useState(400);
  const [method, setMethod] = useState<Method>("auto");
  const [logTime, setLogTime] = useState(false);
  const [measured, setMeasured] = useState<MeasuredCourses | null>(null);
  const [csvNote, setCsvNote] = useState<string | null>(null);
  const [overrides, setOverrides] = useState<string[]>([]);
  const input: JobInput = () => {
    const read = readOverrides(overrides);
    return read.ok && overrides.length > 0 ? { source: text(), overrides: read.settings } : { source: text() };
  };

  const result = simulation.result;
  const fit = useMemo(() => (result && measured ? residuals(measured, result) : null), [result, measured]);

  async function loadCsv(file: File) {
    try {
      const { data, warnings } = readMeasuredCsv(await file.text(), { species: report?.species });
      setMeasured(data);
      setCsvNote(warnings.length ? warnings.join("; ") : `${data.time.length} measured times loaded.`);
    } catch (error) {
      setMeasured(null);
      setCsvNote(error instanceof CsvError ? `That file cannot be used: ${error.message}.` : "That file could not be read.");
    }
  }

  function downloadCsv() {
    if (!result) return;
    const url = URL.createObjectURL(new Blob([simulationCsv(result)], { type: "text/csv" }));
    const link = Object.assign(document.createElement("a"), { href: url, download: `simulation-${mechanismId}.csv` });
    link.click();
    URL.revokeObjectURL(url);
  }

  return (
    <div className="space-y-4" data-testid="dynamics">
      <p className="rounded-md border border-signal bg-signal-soft px-3 py-2 text-xs text-signal" role="note">
        Simulated dynamics model the chemistry as written. They do not replace experimental hazard assessment, local rules or licensed practice.
      </p>

      <OverridesCard overrides={overrides} onChange={setOverrides} />

      <section className="card p-4">
        <form
          className="flex flex-wrap items-end gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            void simulation.run({ kind: "simulate", ...input(), settings: { until, samples, method } });
          }}
        >
          <NumberField label="Until time" value={until} onChange={setUntil} min={1e-9} />
          <NumberField label="Samples" value={samples} onChange={(v) => setSamples(Math.round(v))} min={2} max={MAX_SERVER_SAMPLES} />
          <label className="text-sm">
            <span className="label">Method</span>
            <select className="field py-1.5" value={method} onChange={(e) => setMethod(e.target.value as typeof method)}>
              <option value="auto">automatic</option>
              <option value="stiff">stiff (by tolerance)</option>
              <option value="bdf">stiff, BDF (variable order)</option>
              <option value="rodas4">stiff, Rosenbrock (RODAS4)</option>
              <option value="explicit">explicit (Dormand–Prince)</option>
            </select>
          </label>
          {simulation.running ? (
            <button type="button" className="btn btn-danger" onClick={simulation.cancel}>Cancel</button>
          ) : (
            <button type="submit" className="btn btn-primary" disabled={!source}>Simulate</button>
          )}
          <label className="ml-auto flex items-center gap-2 text-sm">
            <input type="checkbox" checked={logTime} onChange={(e) => setLogTime(e.target.checked)} /> log time axis
          </label>
        </form>
        <JobStatus job={simulation} />
        {result && (
          <>
            <div className="mt-3">
              <TimeCourseChart t={result.t} series={result.series} logTime={logTime} measured={measured} fileName={`simulation-${mechanismId}`} />
            </div>
            <p className="mt-2 text-xs text-muted">
              {result.stats.steps} steps ({result.stats.rejected} rejected, {result.stats.jacobians} Jacobians) in {result.stats.ms.toFixed(0)} ms
              with the {result.method} method{result.stats.method ? ` (${METHOD_NAMES[result.stats.method]})` : ""}{result.switchedAt !== null ? `, switched to stiff at t = ${readableNumberText(result.switchedAt, 3)}` : ""}.
              Drag to zoom, double-click to reset; click a name to hide or show it.
            </p>
            <div className="mt-3 flex flex-wrap items-center gap-3">
              <button type="button" className="btn" onClick={downloadCsv}>Download CSV</button>
              <label className="btn">
                Overlay measured CSV…
                <input type="file" accept=".csv,text/csv" className="sr-only" onChange={(e) => e.target.files?.[0] && loadCsv(e.target.files[0])} />
              </label>
              {csvNote && <span className="text-xs text-muted">{csvNote}</span>}
            </div>
            {fit && <ResidualTable fit={fit} />}
          </>
        )}
      </section>

      {result && (
        <section className="card p-4">
          <h3>Phase portrait</h3>
          <div className="mt-2"><PhasePortrait series={result.series} /></div>
        </section>
      )}

      <StochasticCard url={dynamicsUrl(mechanismId)} input={input} until={until} />

      <div className="grid gap-4 lg:grid-cols-2">
        <EquilibriumCard mechanismId={mechanismId} input={input} settleTime={until} />
        <LyapunovCard mechanismId={mechanismId} input={input} />
      </div>
      <SweepCard mechanismId={mechanismId} text={text} input={input} report={report} until={until} />
      <ContinuationCard url={dynamicsUrl(mechanismId)} text={text} input={input} species={report?.species ?? []} />
    </div>
  );
}

function ResidualTable({ fit }: { fit: ReturnType<typeof residuals> }) {
  return (
    <table className="mt-3 w-full text-sm">
      <thead className="text-left text-xs uppercase tracking-wider text-muted">
        <tr><th className="py-1">Species</th><th>Measured points</th><th>RMS residual</th></tr>
      </thead>
      <tbody>
        {Object.entries(fit).map(([name, r]) => (
          <tr key={name} className="border-t border-line"><td className="py-1 font-medium">{name}</td><td>{r.points}</td><td>{Number.isNaN(r.rms) ? "—" : readableNumberText(r.rms)}</td></tr>
        ))}
      </tbody>
    </table>
  );
}

function EquilibriumCard({ mechanismId, input, settleTime }: { mechanismId: string; input: JobInput; settleTime: number }) {
  const job = useDynamicsJob<EquilibriumResult>(dynamicsUrl(mechanismId));
  const r = job.result;
  return (
    <section className="card p-4">
      <div className="flex items-center justify-between">
        <h3>Equilibria and stability</h3>
        <button className="btn" disabled={job.running} onClick={() => job.run({ kind: "equilibrium", ...input(), options: { settleTime } })}>Find</button>
      </div>
      <JobStatus job={job} />
      {r && <EquilibriumList result={r} />}
    </section>
  );
}

function LyapunovCard({ mechanismId, input }: { mechanismId: string; input: JobInput }) {
  const job = useDynamicsJob<LyapunovResult>(dynamicsUrl(mechanismId));
  const [until, setUntil] = useState(500);
  const r = job.result;
  return (
    <section className="card p-4">
      <div className="flex items-end justify-between gap-3">
        <h3>Largest Lyapunov exponent</h3>
        <div className="flex items-end gap-2">
          <NumberField label="Until" value={until} onChange={setUntil} min={1} />
          {job.running ? (
            <button className="btn btn-danger" onClick={job.cancel}>Cancel</button>
          ) : (
            <button className="btn" onClick={() => job.run({ kind: "lyapunov", ...input(), options: { until } })}>Estimate</button>
          )}
        </div>
      </div>
      <JobStatus job={job} />
      {r && (
        <div className="mt-3 text-sm">
          <p>
            λ₁ ≈ <strong className="font-mono">{readableNumberText(r.largest, 4)}</strong> {r.converged ? "(the running estimate settled)" : "(not yet settled: integrate longer)"}
          </p>
          <p className="mt-1 text-xs text-muted">
            {r.largest > 0.01 && r.converged
              ? "A positive exponent: nearby trajectories separate exponentially — a numerical sign of chaos, not a proof."
              : "No sign of exponential separation of nearby trajectories."}{" "}
            {r.renormalisations} renormalisations after a transient of {readableNumberText(r.transient)}.
          </p>
        </div>
      )}
    </section>
  );
}

const observableNames = { final: "final value", max: "maximum", period: "period" } as const;

function SweepCard({ mechanismId, text, input, report, until }: { mechanismId: string; text: () => string; input: JobInput; report: RoomReport | null; until: number }) {
  const job = useDynamicsJob<SweepResult>(dynamicsUrl(mechanismId));
  const species = report?.species ?? [];
  const [observed, setObserved] = useState("");
  const varied = useVariedQuantity(text, species);
  const { chosen: chosenTarget, from, to } = varied;
  const [points, setPoints] = useState(20);
  const [scale, setScale] = useState<"linear" | "log">("log");
  const [observable, setObservable] = useState<"final" | "max" | "period">("final");
  const chosenSpecies = observed || species[0] || "";

  function start() {
    void job.run({
      kind: "sweep",
      ...input(),
      options: { until, samples: 400, target: sweepTarget(chosenTarget), from, to, points, scale, species: chosenSpecies, observable },
    });
  }

  return (
    <section className="card p-4" data-testid="sweep">
      <h3>Parameter sweep</h3>
      <div className="mt-2 flex flex-wrap items-end gap-3 text-sm">
        <label>
          <span className="label">Vary</span>
          <input className="field w-44 py-1.5" list="sweep-targets" value={chosenTarget} onChange={(e) => varied.choose(e.target.value)} onFocus={varied.reread} placeholder="parameter:T or fixed:B" />
          <datalist id="sweep-targets">{varied.targets.map((t) => <option key={t} value={t} />)}</datalist>
        </label>
        <NumberField label="From" value={from} onChange={(value) => varied.setRange({ from: value })} />
        <NumberField label="To" value={to} onChange={(value) => varied.setRange({ to: value })} />
        <NumberField label="Points" value={points} onChange={(v) => setPoints(Math.round(v))} min={2} max={MAX_SERVER_SWEEP_POINTS} />
        <label>
          <span className="label">Scale</span>
          <select className="field py-1.5" value={scale} onChange={(e) => setScale(e.target.value as typeof scale)}><option>log</option><option>linear</option></select>
        </label>
        <label>
          <span className="label">Observe</span>
          <select className="field py-1.5" value={observable} onChange={(e) => setObservable(e.target.value as typeof observable)}>
            <option value="final">final value</option><option value="max">maximum</option><option value="period">period</option>
          </select>
        </label>
        <label>
          <span className="label">of</span>
          <select className="field py-1.5" value={chosenSpecies} onChange={(e) => setObserved(e.target.value)}>{species.map((s) => <option key={s}>{s}</option>)}</select>
        </label>
        {job.running ? <button className="btn btn-danger" onClick={job.cancel}>Cancel</button> : <button className="btn" onClick={start} disabled={!chosenTarget}>Sweep</button>}
      </div>
      <p className="mt-1 text-xs text-muted">
        Vary an initial concentration (initial:NAME), a parameter such as a temperature (parameter:T), a held species (fixed:NAME) or a labelled
        step&apos;s rate coefficient (step:LABEL); each point simulates to the time set above.
      </p>
      <JobStatus job={job} />
      {job.result && (
        <div className="mt-3">
          <TimeCourseChart
            t={job.result.values}
            series={{ [`${observableNames[observable]} of ${chosenSpecies}`]: job.result.observed.map((v) => v ?? Number.NaN) }}
            logTime={scale === "log"}
            xLabel={sweepTargetLabel(chosenTarget)}
            yLabel={observableNames[observable]}
            fileName={`sweep-${mechanismId}`}
            height={260}
          />
        </div>
      )}
    </section>
  );
}

/** Values that replace the text's own for every run of the panel; the text itself is not changed. */
function OverridesCard({ overrides, onChange }: { overrides: string[]; onChange: (next: string[]) => void }) {
  const [draft, setDraft] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  function add() {
    const read = readOverrides([draft]);
    if (!read.ok) {
      setProblem(read.message);
      return;
    }
    setProblem(null);
    onChange([...overrides, draft.trim()]);
    setDraft("");
  }
  return (
    <section className="card p-4" data-testid="overrides">
      <form
        className="flex flex-wrap items-end gap-3 text-sm"
        onSubmit={(e) => {
          e.preventDefault();
          add();
        }}
      >
        <label>
          <span className="label">Overrides</span>
          <input className="field w-44 py-1.5 font-mono" value={draft} onChange={(e) => setDraft(e.target.value)} placeholder="T=1100 or [A]0=2e-3" aria-label="New override" />
        </label>
        <button className="btn" type="submit" disabled={!draft.trim()}>Add</button>
        <ul className="flex flex-wrap gap-2">
          {overrides.map((each, index) => (
            <li key={`${each}-${index}`} className="pill border border-line font-mono">
              {each}{" "}
              <button type="button" aria-label={`Remove ${each}`} onClick={() => onChange(overrides.filter((_, i) => i !== index))}>×</button>
            </li>
          ))}
        </ul>
      </form>
      <p className="mt-1 text-xs text-muted">{problem ?? "Every run below uses these values in place of the text's; the text is not changed."}</p>
    </section>
  );
}
