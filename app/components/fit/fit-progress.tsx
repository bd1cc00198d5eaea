// A running fit's progress: the iterations taken and how far the cost has fallen, with the fall
// drawn small. Levenberg–Marquardt usually stops long before its cap of iterations, so a bar
// counting toward the cap would say "5 %" for a fit that is nearly done.
import type { FitProgress } from "~/chem/fit/types";
import { readableNumberText } from "~/chem/numbers";
import { JobStatus } from "~/components/dynamics/job-status";
import type { JobState } from "~/components/dynamics/use-dynamics-job";

export function FitStatus({ job }: { job: JobState<unknown> }) {
  if (!job.running || job.queued !== null || job.notes.length === 0) return <JobStatus job={job} />;
  const first = job.notes[0];
  const last = job.notes[job.notes.length - 1];
  return (
    <div className="mt-3 flex items-center gap-3 text-xs text-muted" role="status" data-testid="fit-progress">
      <CostFall notes={job.notes} />
      <span>{fitProgressText(first, last)}</span>
    </div>
  );
}

/** "Iteration 7 · cost 3.2×10⁻⁴, down from 1.5 (×4688 lower)". */
export function fitProgressText(first: FitProgress, last: FitProgress): string {
  const iteration = `Iteration ${last.iteration}`;
  const cost = `cost ${readableNumberText(last.cost, 3)}`;
  if (last.iteration === first.iteration || !(last.cost < first.cost) || !(last.cost > 0)) return `${iteration} · ${cost}`;
  return `${iteration} · ${cost}, down from ${readableNumberText(first.cost, 3)} (×${readableNumberText(first.cost / last.cost, 2)} lower)`;
}

const spark = { width: 96, height: 22 };

/** The cost per iteration on a log scale, so a fall by decades reads as a steady slope. */
function CostFall({ notes }: { notes: FitProgress[] }) {
  const logs = notes.map(({ cost }) => Math.log10(Math.max(cost, Number.MIN_VALUE)));
  const [low, high] = [Math.min(...logs), Math.max(...logs)];
  const x = (i: number) => (notes.length > 1 ? (i / (notes.length - 1)) * spark.width : spark.width / 2);
  const y = (value: number) => (high > low ? 2 + ((high - value) / (high - low)) * (spark.height - 4) : spark.height / 2);
  const path = logs.map((value, i) => `${i ? "L" : "M"}${x(i).toFixed(1)},${y(value).toFixed(1)}`).join("");
  return (
    <svg width={spark.width} height={spark.height} aria-hidden="true" className="shrink-0 overflow-visible">
      <path d={path} fill="none" stroke="var(--mw-accent)" strokeWidth="1.5" />
      <circle cx={x(logs.length - 1)} cy={y(logs[logs.length - 1])} r="2.2" fill="var(--mw-accent)" />
    </svg>
  );
}
