// A waiting job's place in the queue, a running job's progress bar, or the message of a failed one.
import type { JobState } from "./use-dynamics-job";

export function JobStatus({ job }: { job: JobState<unknown> }) {
  if (job.running && job.queued !== null) {
    return (
      <p className="mt-3 text-xs text-muted" role="status" data-testid="job-queued">
        {`Queued (${job.queued - 1} ahead), waiting for a free worker…`}
      </p>
    );
  }
  if (job.running) {
    return (
      <div className="mt-3" role="progressbar" aria-valuenow={Math.round(job.progress * 100)} aria-valuemin={0} aria-valuemax={100}>
        <div className="h-1.5 overflow-hidden rounded-full bg-canvas">
          <div className="h-full bg-accent transition-[width]" style={{ width: `${Math.max(2, job.progress * 100)}%` }} />
        </div>
        <p className="mt-1 text-xs text-muted">Running on the server… {Math.round(job.progress * 100)} %</p>
      </div>
    );
  }
  return job.error ? <p className="notice-error mt-3">{job.error}</p> : null;
}
