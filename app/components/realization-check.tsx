// The side-by-side check of a realization: the original ODE and the realization's mass-action
// ODE simulated from the same start, the realization mapped back (shift subtracted, time change
// undone), drawn on one chart — the realization's samples as markers on the original's curves.
import { useState } from "react";
import type { RealizeOdeResult } from "~/chem/realize/realize-ode";
import type { SimulationResult } from "~/chem/kinetics/simulate";
import { parseMechanism } from "~/chem/parse";
import { monomialValue, undoTransformations } from "~/utils/undo-transformations";
import { JobStatus } from "./dynamics/job-status";
import { TimeCourseChart } from "./dynamics/time-course-chart";
import { useDynamicsJob } from "./dynamics/use-dynamics-job";

export function RealizationCheck({ ode, result, variables }: { ode: string; result: RealizeOdeResult; variables: string[] }) {
  const original = useDynamicsJob<SimulationResult>("/api/v1/simulations");
  const realized = useDynamicsJob<SimulationResult>("/api/v1/simulations");
  const [until, setUntil] = useState(2);
  if (!result.mechanism) return null;

  function compare() {
    const settings = { until, samples: 1000, rtol: 1e-8, atol: 1e-10 };
    void original.run({ ode, settings });
    void realized.run({ source: result.mechanism, settings: { ...settings, until: realizedUntil(result, variables, until), samples: 4000 } });
  }

  const mapped = realized.result ? undoTransformations(realized.result, variables, result.transformations) : null;
  const within = mapped && { time: mapped.t.filter((t) => t <= until), series: {} as Record<string, number[]> };
  if (mapped && within) for (const v of variables) within.series[v] = mapped.series[v].slice(0, within.time.length);

  return (
    <section className="card mt-4 p-5" data-testid="realization-check">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h3>Same trajectories?</h3>
          <p className="mt-1 text-xs text-muted">
            Simulates the ODE as given and the realization from the same start, then maps the realization back to the original variables and clock.
          </p>
        </div>
        <div className="flex items-end gap-2">
          <label className="text-sm">
            <span className="label">Until time</span>
            <input className="field w-24 py-1.5" type="number" step="any" min={0.001} value={until} onChange={(e) => setUntil(Number(e.target.value))} />
          </label>
          <button className="btn" type="button" onClick={compare} disabled={original.running || realized.running}>Compare</button>
        </div>
      </div>
      <JobStatus job={original} />
      <JobStatus job={realized} />
      {original.result && within && (
        <>
          <div className="mt-3">
            <TimeCourseChart t={original.result.t} series={original.result.series} logTime={false} measured={thin(within)} yLabel="value" overlayLabel="realization" />
          </div>
          <p className="mt-1 text-xs text-muted">Lines: the original ODE. Markers: the realization, mapped back. Chaotic systems part ways after a while, as any two integrations do.</p>
        </>
      )}
    </section>
  );
}

/**
 * How long to run the realization to cover the ODE's 0..until on its own clock: the larger of
 * until / M(start) and the clock's estimate along the trajectory (scaled to this horizon), with a
 * margin; the chart trims what lies beyond.
 */
function realizedUntil(result: RealizeOdeResult, variables: string[], until: number): number {
  const estimates = [until / startMultiplier(result, variables)];
  if (result.clock?.suggestedUntil != null) estimates.push((result.clock.suggestedUntil * until) / result.clock.originalUntil);
  return 1.05 * Math.max(...estimates);
}

/** The multiplier at the (shifted) start, which sets the realization's clock speed there. */
function startMultiplier(result: RealizeOdeResult, variables: string[]): number {
  const multiplication = result.transformations.find((t) => t.kind === "multiplication");
  if (!multiplication || multiplication.kind !== "multiplication") return 1;
  const { initial } = parseMechanism(result.mechanism!).mechanism;
  return Math.max(monomialValue(multiplication.monomial, Object.fromEntries(variables.map((v) => [v, initial[v] ?? 0]))), 1e-12);
}

/** About sixty markers are readable; more would hide the lines. */
function thin(course: { time: number[]; series: Record<string, number[]> }) {
  const step = Math.max(1, Math.floor(course.time.length / 60));
  const keep = (values: number[]) => values.filter((_, i) => i % step === 0);
  return { time: keep(course.time), series: Object.fromEntries(Object.entries(course.series).map(([k, v]) => [k, keep(v)])) };
}
