// Runs an API caller's job through the queue: the caller's instance admits it (one running and
// three waiting per user, as `admission.ts` decides), puts it in the queue, and waits for whichever
// process takes it — itself or a `npm run worker` — relaying progress, and cancelling it when the
// caller goes away. Reading text (analyses, exports, imports) stays in this process's own worker
// threads: every page needs it at once, and a queue round trip would only slow it down.
// A stochastic ensemble goes in as several jobs, one per range of runs, so the consumers' lanes
// share it; each run is seeded by its index, so the merged answer is the one a single worker gives.
import { randomUUID } from "node:crypto";
import { z } from "zod";
import { SimulationCancelled } from "~/chem/kinetics/errors";
import { mergeTallies, summarizeTally, type EnsembleTally, type StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { Admission } from "./admission";
import { isTextJob, type DynamicsJob, type JobResult } from "./job";
import { rebuildError } from "./job-errors";
import { DYNAMICS_QUEUE, type JobQueue, type QueuedJob, type QueuedJobData } from "./job-queue";
import { DEFAULT_LIMITS, type JobRunnerOptions, type RunJob, type RunOptions, type WorkerJobs } from "./run-in-worker";

/** How often a waiting caller reads its job's state, in case an event was missed or its worker died. */
const POLL_MS = 2_000;
/** Time a worker may take to pick up and boot a job beyond the run's own limit, before the queue gives up on it. */
const EXPIRY_MARGIN_S = 60;

const errorOutput = z.object({ name: z.string(), message: z.string(), limit: z.string().optional() });

interface Waiter {
  progress(fraction: number): void;
  /** Reads the job's state and settles the caller's promise if it is over. */
  check(): void;
  fail(error: unknown): void;
  /** Starts reading the job's state every POLL_MS, once it is stored. */
  poll(): void;
}

export class QueuedJobs {
  private readonly admission: Admission;
  private readonly waiters = new Map<string, Waiter>();
  private readonly timeMs: number;

  constructor(
    private readonly queue: JobQueue,
    /** This process's worker threads, for reading text. */
    private readonly local: WorkerJobs,
    { limits = {}, runningPerUser = 1, queuedPerUser = 3 }: JobRunnerOptions = {},
  ) {
    // The queue's consumers bound how many jobs run at once; this door bounds each user.
    this.admission = new Admission({ concurrency: Infinity, running: runningPerUser, queued: queuedPerUser }, 10);
    this.timeMs = limits.timeMs ?? DEFAULT_LIMITS.timeMs;
    queue.events.on((event) => {
      if (event.type === "progress") this.waiters.get(event.id)?.progress(event.fraction);
      else if (event.type === "finished") this.waiters.get(event.id)?.check();
    });
  }

  readonly run: RunJob = async (job, options = {}) => {
    if (isTextJob(job)) return this.local.run(job, options);
    const release = await this.admission.admit(options.owner ?? "", options, () => new SimulationCancelled());
    options.onStart?.();
    try {
      if (job.kind === "stochastic") return (await this.submitEnsemble(job, options)) as JobResult<typeof job>;
      return (await this.submit(job, options)) as JobResult<typeof job>;
    } finally {
      release();
    }
  };

  /** One queued job per range of runs (as many as this process has lanes), merged in run order; a failed range cancels the rest. */
  private async submitEnsemble(job: Extract<DynamicsJob, { kind: "stochastic" }>, { signal, onProgress }: RunOptions): Promise<StochasticResult> {
    const { runs, volume } = job.settings;
    const ranges = splitRuns(runs, this.local.lanes);
    const done = ranges.map(() => 0);
    const stopRest = new AbortController();
    const cancel = () => stopRest.abort();
    signal?.addEventListener("abort", cancel, { once: true });
    try {
      const tallies = await Promise.all(
        ranges.map((range, i) =>
          this.submit({ kind: "stochasticRange", model: job.model, settings: job.settings, ...range }, {
            signal: stopRest.signal,
            onProgress(fraction) {
              done[i] = fraction * range.runs;
              onProgress?.(done.reduce((sum, n) => sum + n, 0) / runs);
            },
          }),
        ),
      );
      return summarizeTally(mergeTallies(tallies as EnsembleTally[]), volume);
    } finally {
      cancel();
      signal?.removeEventListener("abort", cancel);
    }
  }

  private async submit(job: QueuedJob, { signal, onProgress }: RunOptions): Promise<unknown> {
    if (signal?.aborted) throw new SimulationCancelled();
    const { boss, events } = this.queue;
    // The id is ours, so the waiter is listening before any worker can finish the job.
    const id = randomUUID();
    const result = new Promise<unknown>((resolve, reject) => {
      let settled = false;
      let poll: NodeJS.Timeout | undefined;
      const settle = (outcome: () => void) => {
        if (settled) return;
        settled = true;
        clearInterval(poll);
        signal?.removeEventListener("abort", cancel);
        this.waiters.delete(id);
        outcome();
      };
      const check = async () => {
        const row = await boss.getJobById<QueuedJobData>(DYNAMICS_QUEUE, id).catch(() => undefined);
        if (row === undefined || settled) return;
        if (row?.state === "completed") settle(() => resolve(row.output));
        else if (row?.state === "failed") settle(() => reject(failure(row.output)));
        else if (row?.state === "cancelled") settle(() => reject(new SimulationCancelled()));
        else if (!row) settle(() => reject(new Error("the job left the queue unfinished")));
        else return;
        if (row) void boss.deleteJob(DYNAMICS_QUEUE, id).catch(() => undefined);
      };
      const cancel = () => {
        settle(() => reject(new SimulationCancelled()));
        void boss.cancel(DYNAMICS_QUEUE, id).then(() => events.publish({ type: "cancel", id }), () => undefined);
      };
      signal?.addEventListener("abort", cancel, { once: true });
      this.waiters.set(id, {
        progress: (fraction) => settled || onProgress?.(fraction),
        check: () => void check(),
        fail: (error) => settle(() => reject(error)),
        poll: () => void (poll ??= setInterval(() => void check(), POLL_MS)),
      });
    });
    // A cancel may reject it while the job is still being stored, before anyone awaits it.
    result.catch(() => undefined);
    try {
      await boss.send(DYNAMICS_QUEUE, { job } satisfies QueuedJobData, {
        id,
        retryLimit: 0,
        expireInSeconds: Math.ceil(this.timeMs / 1000) + EXPIRY_MARGIN_S,
      });
    } catch (error) {
      this.waiters.get(id)?.fail(error);
      return result;
    }
    // A caller that left while the job was being stored cancels it now that it exists.
    if (signal?.aborted) void boss.cancel(DYNAMICS_QUEUE, id).catch(() => undefined);
    else void events.publish({ type: "submitted" });
    this.waiters.get(id)?.poll();
    return result;
  }
}

/** A failed job's error: ours as the consumer recorded it, or the queue's own word (its worker died). */
function failure(output: unknown): Error {
  const recorded = errorOutput.safeParse(output);
  return recorded.success ? rebuildError(recorded.data) : new Error("the worker running this job stopped before it finished");
}

/** `runs` in at most `parts` contiguous ranges whose sizes differ by at most one. */
export function splitRuns(runs: number, parts: number): { first: number; runs: number }[] {
  const count = Math.max(1, Math.min(runs, parts));
  return Array.from({ length: count }, (_, i) => {
    const first = Math.floor((i * runs) / count);
    return { first, runs: Math.floor(((i + 1) * runs) / count) - first };
  });
}
