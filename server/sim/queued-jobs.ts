// Runs an API caller's job through the queue: the caller's instance stores it (refused when its
// owner already has one running and three waiting in the queue, counted in the database over every
// instance: `queue-table.ts`) and waits for whichever process takes it — itself or a
// `npm run worker` — relaying its place in line while it waits, then its progress, and cancelling
// it when the caller goes away. Reading text (analyses, exports, imports) stays in this process's
// own worker threads: every page needs it at once, and a queue round trip would only slow it down.
// A stochastic ensemble goes in as several jobs, one per range of runs, so the consumers' lanes
// share it; each run is seeded by its index, so the merged answer is the one a single worker gives.
import type { FitProgress } from "~/chem/fit/types";
import { randomUUID } from "node:crypto";
import { z } from "zod";
import { SimulationCancelled } from "~/chem/kinetics/errors";
import { mergeTallies, summarizeTally, type EnsembleTally, type StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { isTextJob, type DynamicsJob, type JobResult } from "./job";
import { rebuildError } from "./job-errors";
import { DYNAMICS_QUEUE, type JobQueue, type QueuedJob } from "./job-queue";
import { readJob, submitWithinLimits, type OwnerLimits } from "./queue-table";
import { DEFAULT_LIMITS, type JobRunnerOptions, type RunJob, type RunOptions, type WorkerJobs } from "./run-in-worker";

/** How often a waiting caller reads its job's state, in case an event was missed or its worker died. */
const POLL_MS = 2_000;
/** A job still waiting this long after it was stored is in line: its caller hears its place from then on. */
const IN_LINE_AFTER_MS = 500;
/** Time a worker may take to pick up and boot a job beyond the run's own limit, before the queue gives up on it. */
const EXPIRY_MARGIN_S = 60;

const errorOutput = z.object({ name: z.string(), message: z.string(), limit: z.string().optional() });

interface Waiter {
  /** True until the job is seen running: only waiting jobs care that others started or ended. */
  waiting: boolean;
  progress(fraction: number, note?: FitProgress): void;
  /** Reads the job's state: settles the caller's promise if it is over, reports its place if it waits. */
  check(): void;
}

export class QueuedJobs {
  private readonly limits: OwnerLimits;
  private readonly waiters = new Map<string, Waiter>();
  private readonly timeMs: number;

  constructor(
    private readonly queue: JobQueue,
    /** This process's worker threads, for reading text. */
    private readonly local: WorkerJobs,
    { limits = {}, runningPerUser = 1, queuedPerUser = 3 }: JobRunnerOptions = {},
  ) {
    this.limits = { running: runningPerUser, queued: queuedPerUser };
    this.timeMs = limits.timeMs ?? DEFAULT_LIMITS.timeMs;
    queue.events.on((event) => {
      if (event.type === "progress") this.waiters.get(event.id)?.progress(event.fraction, event.note);
      if (event.type === "finished") this.waiters.get(event.id)?.check();
      // A job started, ended or left the line: the places behind it moved.
      if (event.type !== "progress" && event.type !== "submitted") for (const waiter of this.waiters.values()) if (waiter.waiting) waiter.check();
    });
  }

  readonly run: RunJob = async (job, options = {}) => {
    if (isTextJob(job)) return this.local.run(job, options);
    if (job.kind === "stochastic") return (await this.submitEnsemble(job, options)) as JobResult<typeof job>;
    const { result } = await this.store(job, options, { owner: options.owner ?? "", limits: this.limits });
    return (await result) as JobResult<typeof job>;
  };

  /**
   * One queued job per range of runs (as many as this process has lanes), merged in run order; a
   * failed range cancels the rest. The first range counts against the user's limits (and may be
   * refused); the others go under a key of this ensemble's own that lets them all run at once.
   */
  private async submitEnsemble(job: Extract<DynamicsJob, { kind: "stochastic" }>, options: RunOptions): Promise<StochasticResult> {
    const { runs, volume } = job.settings;
    const ranges = splitRuns(runs, this.local.lanes);
    const done = ranges.map(() => 0);
    const stopRest = new AbortController();
    const cancel = () => stopRest.abort();
    options.signal?.addEventListener("abort", cancel, { once: true });
    const rangeOptions = (i: number): RunOptions => ({
      signal: stopRest.signal,
      onProgress(fraction) {
        done[i] = fraction * ranges[i].runs;
        options.onProgress?.(done.reduce((sum, n) => sum + n, 0) / runs);
      },
    });
    const rangeJob = (i: number): QueuedJob => ({ kind: "stochasticRange", model: job.model, settings: job.settings, ...ranges[i] });
    try {
      const first = await this.store(rangeJob(0), { ...rangeOptions(0), onQueued: options.onQueued, onStart: options.onStart }, { owner: options.owner ?? "", limits: this.limits });
      const ensemble = { owner: `ensemble:${randomUUID()}`, limits: { running: ranges.length, queued: ranges.length } };
      const rest = await Promise.all(ranges.slice(1).map((_, k) => this.store(rangeJob(k + 1), rangeOptions(k + 1), ensemble)));
      const tallies = await Promise.all([first, ...rest].map(({ result }) => result));
      return summarizeTally(mergeTallies(tallies as EnsembleTally[]), volume);
    } finally {
      cancel();
      options.signal?.removeEventListener("abort", cancel);
    }
  }

  /** Stores the job under `key`'s limits; `result` settles when the job is over. */
  private async store(job: QueuedJob, { signal, onProgress, onQueued, onStart }: RunOptions, key: { owner: string; limits: OwnerLimits }): Promise<{ result: Promise<unknown> }> {
    if (signal?.aborted) throw new SimulationCancelled();
    const { boss, events, sql } = this.queue;
    // The id is ours, so the waiter is listening before any worker can finish the job.
    const id = randomUUID();
    let settled = false;
    let timer: NodeJS.Timeout | undefined;
    let lastPlace = 0;
    const result = new Promise<unknown>((resolve, reject) => {
      const settle = (outcome: () => void) => {
        if (settled) return;
        settled = true;
        clearTimeout(timer);
        signal?.removeEventListener("abort", cancel);
        this.waiters.delete(id);
        outcome();
      };
      const check = async () => {
        const row = await readJob(sql, DYNAMICS_QUEUE, id).catch(() => undefined);
        if (row === undefined || settled) return;
        if (row?.state === "completed") settle(() => resolve(row.output));
        else if (row?.state === "failed") settle(() => reject(failure(row.output)));
        else if (row?.state === "cancelled") settle(() => reject(new SimulationCancelled()));
        else if (!row) settle(() => reject(new Error("the job left the queue unfinished")));
        else {
          waiter.waiting = row.place !== null;
          if (row.place !== null && row.place !== lastPlace) onQueued?.((lastPlace = row.place));
          return;
        }
        if (row) void boss.deleteJob(DYNAMICS_QUEUE, id).catch(() => undefined);
      };
      const cancel = () => {
        settle(() => reject(new SimulationCancelled()));
        void boss.cancel(DYNAMICS_QUEUE, id).then(() => events.publish({ type: "cancel", id }), () => undefined);
      };
      signal?.addEventListener("abort", cancel, { once: true });
      const waiter: Waiter = {
        waiting: false,
        progress: (fraction, note) => {
          waiter.waiting = false;
          if (!settled) onProgress?.(fraction, note);
        },
        check: () => void check(),
      };
      this.waiters.set(id, waiter);
    });
    // A cancel may reject it while the job is still being stored, before anyone awaits it.
    result.catch(() => undefined);
    try {
      await submitWithinLimits(sql, boss, key.limits, {
        queue: DYNAMICS_QUEUE,
        id,
        owner: key.owner,
        job,
        expireInSeconds: Math.ceil(this.timeMs / 1000) + EXPIRY_MARGIN_S,
      });
    } catch (error) {
      // Refused (the owner's line is full) or not stored: nothing to wait for.
      this.waiters.delete(id);
      throw error;
    }
    // A caller that left while the job was being stored cancels it now that it exists.
    if (signal?.aborted) {
      void boss.cancel(DYNAMICS_QUEUE, id).catch(() => undefined);
      return { result };
    }
    onStart?.();
    void events.publish({ type: "submitted" });
    const poll = (delay: number) => {
      timer = setTimeout(() => {
        this.waiters.get(id)?.check();
        if (!settled) poll(POLL_MS);
      }, delay);
    };
    poll(IN_LINE_AFTER_MS);
    return { result };
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
