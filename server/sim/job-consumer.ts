// Takes dynamics jobs from the queue — the oldest whose owner runs nothing now, so the per-user cap
// holds across processes (`queue-table.ts`) — and runs them in this process's worker threads (with
// their time and heap limits), one job per lane: an app instance runs jobs this way unless started with
// JOBS=off, and a `npm run worker` process does nothing else. Progress and the end are announced
// on `JobEvents`; the result (its `stats.ranOn` naming this process) or the error is the job's
// output in the queue, where the caller reads it.
import { z } from "zod";
import { SimulationCancelled } from "~/chem/kinetics/errors";
import { errorRecord } from "./job-errors";
import { DYNAMICS_QUEUE, type JobQueue, type QueuedJob } from "./job-queue";
import { takeNext } from "./queue-table";
import type { WorkerJobs } from "./run-in-worker";

/** How long an idle lane waits before asking the queue again when no `submitted` event wakes it. */
const IDLE_POLL_MS = 1_000;

/** The envelope of a queued job; the job's own settings are checked by its schema in the worker thread. */
const queuedJobData = z.object({
  job: z.looseObject({ kind: z.enum(["simulate", "stochasticRange", "lyapunov", "equilibrium", "sweep", "continuation", "fit", "sensitivity", "witness", "realize"]) }),
});

export interface ConsumerOptions {
  /** Jobs this process runs at once. */
  lanes: number;
  /** This process's instance id, written into every result's `stats.ranOn`. */
  ranOn: string;
}

export class JobConsumer {
  private readonly running = new Map<string, AbortController>();
  private readonly idleLanes = new Set<() => void>();
  private lanes: Promise<void>[] = [];
  private stopping = false;
  private unsubscribe = () => {};

  constructor(
    private readonly queue: JobQueue,
    private readonly jobs: WorkerJobs,
    private readonly options: ConsumerOptions,
  ) {}

  start(): this {
    this.unsubscribe = this.queue.events.on((event) => {
      if (event.type === "submitted") this.wakeIdleLanes();
      else if (event.type === "cancel") this.running.get(event.id)?.abort();
    });
    this.lanes = Array.from({ length: this.options.lanes }, () => this.lane());
    return this;
  }

  /** Stops taking jobs; jobs still running fail with a message that asks for a new run. */
  async stop(): Promise<void> {
    this.stopping = true;
    this.unsubscribe();
    this.wakeIdleLanes();
    for (const controller of this.running.values()) controller.abort();
    await Promise.all(this.lanes);
  }

  private async lane(): Promise<void> {
    while (!this.stopping) {
      const taken = await takeNext(this.queue.sql, DYNAMICS_QUEUE).catch(() => null);
      if (taken) await this.runJob(taken.id, taken.data);
      else await this.idle();
    }
  }

  private idle(): Promise<void> {
    return new Promise((resolve) => {
      const wake = () => {
        clearTimeout(timer);
        this.idleLanes.delete(wake);
        resolve();
      };
      const timer = setTimeout(wake, IDLE_POLL_MS);
      this.idleLanes.add(wake);
    });
  }

  private wakeIdleLanes() {
    for (const wake of [...this.idleLanes]) wake();
  }

  private async runJob(id: string, data: unknown): Promise<void> {
    const { boss, events } = this.queue;
    const controller = new AbortController();
    this.running.set(id, controller);
    void events.publish({ type: "started", id });
    let lastSent = -1;
    try {
      const envelope = queuedJobData.safeParse(data);
      if (!envelope.success) throw new Error("the queued job is not a job this worker knows");
      const result = await this.jobs.run(envelope.data.job as QueuedJob, {
        signal: controller.signal,
        // Each job its own owner: the callers' instances already applied the per-user caps.
        owner: id,
        onProgress: (fraction, note) => {
          // About one event per percent is plenty for a progress bar; a fit's every iteration is news.
          if (!note && fraction - lastSent < 0.01 && fraction < 1) return;
          lastSent = fraction;
          void events.publish({ type: "progress", id, fraction, ...(note && { note }) });
        },
      });
      await boss.complete(DYNAMICS_QUEUE, id, withRanOn(result, this.options.ranOn));
    } catch (error) {
      // A caller's cancel already marked the job; only this process's own stop needs saying.
      if (error instanceof SimulationCancelled && !this.stopping) return;
      const record = this.stopping ? { name: "Error", message: "the worker running this job was stopped; run it again" } : errorRecord(error);
      await boss.fail(DYNAMICS_QUEUE, id, record).catch(() => undefined);
    } finally {
      this.running.delete(id);
    }
    await events.publish({ type: "finished", id });
  }
}

/** The result with `stats.ranOn` added (results without statistics get `stats` for it alone). */
function withRanOn(result: unknown, ranOn: string): object {
  const { stats, ...rest } = result as { stats?: object };
  return { ...rest, stats: { ...stats, ranOn } };
}
