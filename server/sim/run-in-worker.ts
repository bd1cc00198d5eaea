// Runs jobs off the event loop: each job in its own worker thread, with limits on model size,
// samples, wall time and heap, progress callbacks, and cancellation by AbortSignal (the worker is
// terminated, so even a step that never returns is stopped). Which job may start is decided by
// `admission.ts`: a few at once (as many as the worker budget allows), one per user and kind at a
// time, a short queue per user.

import type { FitProgress } from "~/chem/fit/types";
import { Worker } from "node:worker_threads";
import { MAX_SERVER_SAMPLES, MAX_SERVER_SWEEP_POINTS } from "~/chem/limits";
import { SimulationCancelled } from "~/chem/kinetics/errors";
import { workerScript } from "../worker-script";
import type { WorkerBudget } from "../worker-budget";
import { Admission } from "./admission";
import { rebuildError } from "./job-errors";
import { isTextJob, SimulationLimitError, type JobResult, type SizeLimits, type WorkerJob } from "./job";
import type { WorkerMessage, WorkerRequest } from "./worker";

export { SimulationLimitError };

export interface RunLimits extends SizeLimits {
  /** Wall-clock limit per dynamics or realization job, queueing excluded. */
  timeMs: number;
  /** Wall-clock limit for reading user text: analysis, export, import. */
  analysisTimeMs: number;
  heapMb: number;
}

export const DEFAULT_LIMITS: RunLimits = {
  timeMs: 60_000,
  analysisTimeMs: 20_000,
  /**
   * The Jacobian is held dense (n² numbers); networks with local structure factor sparsely, but
   * one without it costs O(n³) per stiff step — the time limit then stops it.
   */
  maxVariables: 2_000,
  maxReactions: 10_000,
  maxSamples: MAX_SERVER_SAMPLES,
  maxSweepPoints: MAX_SERVER_SWEEP_POINTS,
  heapMb: 512,
};

export interface RunOptions {
  limits?: Partial<RunLimits>;
  /** `note`: a fit's iterations and cost, for the bar to show instead of a share. */
  onProgress?: (fraction: number, note?: FitProgress) => void;
  /** Called once the job has a worker. */
  onStart?: () => void;
  /** Called with the job's place in the queue while it waits for a worker. */
  onQueued?: (position: number) => void;
  signal?: AbortSignal;
  /** Whose job this is (a user id, or a guest's address): the per-user cap counts by it. */
  owner?: string;
}

const entry = workerScript(new URL("./worker.ts", import.meta.url), "job-thread.js");

export interface JobRunnerOptions {
  /** Default limits of every job (a job's own options may lower or raise them); DEFAULT_LIMITS elsewhere. */
  limits?: Partial<RunLimits>;
  /** Jobs one user may run at once, per lane. */
  runningPerUser?: number;
  /** Jobs one user may have waiting, per lane; one more is refused. */
  queuedPerUser?: number;
}

/** Runs one job in a worker thread, within the runner's default limits and `options.limits`. */
export type RunJob = <J extends WorkerJob>(job: J, options?: RunOptions) => Promise<JobResult<J>>;

/**
 * The worker threads of API jobs, sized by the process's worker budget.
 *
 * Booting a worker (tsx, then the chemistry modules and mathjs) takes a second or two, so workers
 * that finish a job cleanly wait for the next one. A cancelled, timed-out or failed worker is
 * terminated and never reused. Idle workers do not keep the process alive.
 */
export class WorkerJobs {
  /**
   * One running job per user and kind and three waiting; a fourth waiting is refused. Reading text
   * and running dynamics are admitted apart: analyses are short and bounded by their own time limit,
   * so minutes-long simulations of other users must not hold up everyone's exports and API reads.
   */
  private readonly admissions: Record<"text" | "dynamics", Admission>;
  private readonly poolSize: number;
  private readonly idle = new Map<number, Worker[]>();
  /** Resolves once a worker has loaded its modules: time limits count from then, not from its boot. */
  private readonly loaded = new WeakMap<Worker, Promise<void>>();

  private readonly defaults: Partial<RunLimits>;

  constructor(budget: WorkerBudget, { limits = {}, runningPerUser = 1, queuedPerUser = 3 }: JobRunnerOptions = {}) {
    this.poolSize = budget.jobsAtOnce;
    this.defaults = limits;
    const admissionLimits = { concurrency: this.poolSize, running: runningPerUser, queued: queuedPerUser };
    this.admissions = { text: new Admission(admissionLimits, 10), dynamics: new Admission(admissionLimits, 10) };
  }

  /** Jobs this process runs at once (a stochastic ensemble is split into as many ranges). */
  get lanes(): number {
    return this.poolSize;
  }

  readonly run: RunJob = async (job, options = {}) => {
    const limits = { ...DEFAULT_LIMITS, ...this.defaults, ...options.limits };
    // Reading text is quick and shows on every page: a user's simulation must not hold up their exports.
    const lane = isTextJob(job) ? "text" : "dynamics";
    const release = await this.admissions[lane].admit(options.owner ?? "", options, () => new SimulationCancelled());
    options.onStart?.();
    try {
      return await this.runWorker(job, limits, options);
    } finally {
      release();
    }
  };

  /** Boots the workers a busy server will want, so the first run does not wait for them. */
  prewarm(heapMb = DEFAULT_LIMITS.heapMb): void {
    for (let i = this.idle.get(heapMb)?.length ?? 0; i < this.poolSize; i++) this.returnWorker(this.takeWorker(heapMb), heapMb);
  }

  private takeWorker(heapMb: number): Worker {
    const reused = this.idle.get(heapMb)?.pop();
    if (reused) {
      reused.ref();
      return reused;
    }
    const worker = new Worker(entry.script, { eval: entry.eval, resourceLimits: { maxOldGenerationSizeMb: heapMb } });
    this.loaded.set(worker, new Promise((resolve) => worker.once("message", (message: WorkerMessage) => message.type === "ready" && resolve())));
    // While idle nobody else listens: an idle worker that dies just leaves the pool.
    worker.on("error", () => undefined);
    worker.on("exit", () => {
      const pool = this.idle.get(heapMb);
      if (pool?.includes(worker)) pool.splice(pool.indexOf(worker), 1);
    });
    return worker;
  }

  private returnWorker(worker: Worker, heapMb: number) {
    const pool = this.idle.get(heapMb) ?? [];
    if (pool.length >= this.poolSize) return void worker.terminate();
    worker.unref();
    pool.push(worker);
    this.idle.set(heapMb, pool);
  }

  private runWorker<J extends WorkerJob>(job: J, limits: RunLimits, { onProgress, signal }: RunOptions): Promise<JobResult<J>> {
    return new Promise((resolve, reject) => {
      if (signal?.aborted) return reject(new SimulationCancelled());
      const worker = this.takeWorker(limits.heapMb);
      let settled = false;
      const finish = (reusable: boolean, outcome: () => void) => {
        if (settled) return;
        settled = true;
        clearTimeout(timer);
        signal?.removeEventListener("abort", cancel);
        worker.off("message", onMessage).off("error", onError).off("exit", onExit);
        if (reusable) this.returnWorker(worker, limits.heapMb);
        else void worker.terminate();
        outcome();
      };
      const [what, timeMs] = isTextJob(job) ? ["analysis", limits.analysisTimeMs] : ["run", limits.timeMs];
      let timer: NodeJS.Timeout | undefined;
      void this.loaded.get(worker)!.then(() => {
        if (settled) return;
        timer = setTimeout(
          () => finish(false, () => reject(new SimulationLimitError(`the ${what} took longer than ${timeMs / 1000} s and was stopped`, "time"))),
          timeMs,
        );
      });
      const cancel = () => finish(false, () => reject(new SimulationCancelled()));
      signal?.addEventListener("abort", cancel, { once: true });

      const onMessage = (message: WorkerMessage) => {
        if (message.type === "ready") return;
        if (message.type === "progress") onProgress?.(message.fraction, message.note);
        else if (message.type === "result") finish(true, () => resolve(message.result as JobResult<J>));
        else finish(true, () => reject(rebuildError(message)));
      };
      const onError = (error: Error) => {
        const outOfMemory = (error as NodeJS.ErrnoException).code === "ERR_WORKER_OUT_OF_MEMORY";
        finish(false, () => reject(outOfMemory ? new SimulationLimitError(`the run needed more than ${limits.heapMb} MB and was stopped`, "memory") : error));
      };
      const onExit = (code: number) => finish(false, () => reject(new Error(`the simulation worker stopped unexpectedly (exit code ${code})`)));
      worker.on("message", onMessage).on("error", onError).on("exit", onExit);
      const { maxVariables, maxReactions, maxSamples, maxSweepPoints } = limits;
      worker.postMessage({ job, limits: { maxVariables, maxReactions, maxSamples, maxSweepPoints } } satisfies WorkerRequest);
    });
  }
}
