// Runs an API caller's job through the queue: the caller's instance stores it (refused when its
// owner already has one running and three waiting in the queue, counted in the database over every
// instance: `queue-table.ts`) and waits for whichever process takes it — itself or a
// `npm run worker` — relaying its place in line while it waits, then its progress, and cancelling
// it when the caller goes away. Reading text (analyses, exports, imports) stays in this process's
// own worker threads: every page needs it at once, and a queue round trip would only slow it down.
import { randomUUID } from "node:crypto";
import { z } from "zod";
import { SimulationCancelled } from "~/chem/kinetics/errors";
import { isTextJob, type JobResult } from "./job";
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
  progress(fraction: number): void;
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
      if (event.type === "progress") this.waiters.get(event.id)?.progress(event.fraction);
      if (event.type === "finished") this.waiters.get(event.id)?.check();
      // A job started, ended or left the line: the places behind it moved.
      if (event.type !== "progress" && event.type !== "submitted") for (const waiter of this.waiters.values()) if (waiter.waiting) waiter.check();
    });
  }

  readonly run: RunJob = async (job, options = {}) => {
    if (isTextJob(job)) return this.local.run(job, options);
    return (await this.submit(job, options)) as JobResult<typeof job>;
  };

  private async submit(job: QueuedJob, { signal, onProgress, onQueued, onStart, owner = "" }: RunOptions): Promise<unknown> {
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
        progress: (fraction) => {
          waiter.waiting = false;
          if (!settled) onProgress?.(fraction);
        },
        check: () => void check(),
      };
      this.waiters.set(id, waiter);
    });
    // A cancel may reject it while the job is still being stored, before anyone awaits it.
    result.catch(() => undefined);
    try {
      await submitWithinLimits(sql, boss, this.limits, {
        queue: DYNAMICS_QUEUE,
        id,
        owner,
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
      return result;
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
    return result;
  }
}

/** A failed job's error: ours as the consumer recorded it, or the queue's own word (its worker died). */
function failure(output: unknown): Error {
  const recorded = errorOutput.safeParse(output);
  return recorded.success ? rebuildError(recorded.data) : new Error("the worker running this job stopped before it finished");
}
