// Runs dynamics jobs off the event loop: each job in its own worker thread, with limits on model
// size, samples, wall time and heap, progress callbacks, and cancellation by AbortSignal (the
// worker is terminated, so even a step that never returns is stopped). At most `concurrency` jobs
// run at once; the rest wait in order.

import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { IntegrationFailure, SimulationCancelled, SimulationInputError } from "~/chem/kinetics/errors";
import { MAX_SWEEP_POINTS } from "~/chem/kinetics/sweep";
import { RealizeRequestError } from "~/chem/realize/request-error";
import { typescriptWorkerSource } from "../typescript-worker";
import { modelSize, type DynamicsJob, type JobResult, type WorkerJob } from "./job";
import type { WorkerMessage } from "./worker";

export interface RunLimits {
  /** Wall-clock limit per job, queueing excluded. */
  timeMs: number;
  /**
   * The Jacobian is held dense (n² numbers); networks with local structure factor sparsely, but
   * one without it costs O(n³) per stiff step — the time limit then stops it.
   */
  maxVariables: number;
  maxReactions: number;
  maxSamples: number;
  maxSweepPoints: number;
  heapMb: number;
}

export const DEFAULT_LIMITS: RunLimits = {
  timeMs: 60_000,
  maxVariables: 2_000,
  maxReactions: 10_000,
  maxSamples: 20_000,
  maxSweepPoints: 200,
  heapMb: 512,
};

/** A job is bigger, longer or hungrier than this server runs; `limit` says which. */
export class SimulationLimitError extends Error {
  override name = "SimulationLimitError";
  constructor(
    message: string,
    readonly limit: "size" | "time" | "memory",
  ) {
    super(message);
  }
}

export interface RunOptions {
  limits?: Partial<RunLimits>;
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

const rebuilt: Record<string, new (message: string) => Error> = {
  SimulationInputError,
  IntegrationFailure,
  RealizeRequestError,
};

const workerBootstrap = typescriptWorkerSource(new URL("./worker.ts", import.meta.url));

/** Jobs running at once: one core stays with the server, but never fewer than two, so one long run cannot hold up everybody. */
const CONCURRENCY = Math.max(2, availableParallelism() - 1);
let running = 0;
const waiting: (() => void)[] = [];

export async function runInWorker<J extends WorkerJob>(job: J, options: RunOptions = {}): Promise<JobResult<J>> {
  const limits = { ...DEFAULT_LIMITS, ...options.limits };
  if (job.kind !== "realize" && job.kind !== "analyze") checkSize(job, limits);
  await acquireSlot(options.signal);
  try {
    return await runWorker(job, limits, options);
  } finally {
    releaseSlot();
  }
}

function checkSize(job: DynamicsJob, limits: RunLimits): void {
  const { variables, reactions } = modelSize(job.model);
  if (variables > limits.maxVariables) throw new SimulationLimitError(`the model has ${variables} variables; at most ${limits.maxVariables} can be simulated here`, "size");
  if (reactions > limits.maxReactions) throw new SimulationLimitError(`the model has ${reactions} reactions; at most ${limits.maxReactions} can be simulated here`, "size");
  const samples = job.kind === "simulate" ? job.settings.samples : job.kind === "sweep" ? job.options.samples : 0;
  if (samples > limits.maxSamples) throw new SimulationLimitError(`at most ${limits.maxSamples} samples per run`, "size");
  const points = job.kind === "sweep" ? job.options.points : 0;
  if (points > Math.min(limits.maxSweepPoints, MAX_SWEEP_POINTS)) throw new SimulationLimitError(`at most ${Math.min(limits.maxSweepPoints, MAX_SWEEP_POINTS)} sweep points`, "size");
}

function acquireSlot(signal?: AbortSignal): Promise<void> {
  if (signal?.aborted) return Promise.reject(new SimulationCancelled());
  if (running < CONCURRENCY) {
    running++;
    return Promise.resolve();
  }
  return new Promise((resolve, reject) => {
    const start = () => {
      signal?.removeEventListener("abort", cancel);
      running++;
      resolve();
    };
    const cancel = () => {
      waiting.splice(waiting.indexOf(start), 1);
      reject(new SimulationCancelled());
    };
    signal?.addEventListener("abort", cancel, { once: true });
    waiting.push(start);
  });
}

function releaseSlot(): void {
  running--;
  waiting.shift()?.();
}

// Booting a worker (tsx, then the chemistry modules and mathjs) takes a second or two, so workers
// that finish a job cleanly wait for the next one. A cancelled, timed-out or failed worker is
// terminated and never reused. Idle workers do not keep the process alive.
const idle = new Map<number, Worker[]>();

function takeWorker(heapMb: number): Worker {
  const reused = idle.get(heapMb)?.pop();
  if (reused) {
    reused.ref();
    return reused;
  }
  const worker = new Worker(workerBootstrap, { eval: true, resourceLimits: { maxOldGenerationSizeMb: heapMb } });
  // While idle nobody else listens: an idle worker that dies just leaves the pool.
  worker.on("error", () => undefined);
  worker.on("exit", () => {
    const pool = idle.get(heapMb);
    if (pool?.includes(worker)) pool.splice(pool.indexOf(worker), 1);
  });
  return worker;
}

function returnWorker(worker: Worker, heapMb: number) {
  const pool = idle.get(heapMb) ?? [];
  if (pool.length >= CONCURRENCY) return void worker.terminate();
  worker.unref();
  pool.push(worker);
  idle.set(heapMb, pool);
}

/** Boots the workers a busy server will want, so the first run does not wait for them. */
export function prewarmWorkers(heapMb = DEFAULT_LIMITS.heapMb): void {
  for (let i = (idle.get(heapMb)?.length ?? 0); i < CONCURRENCY; i++) returnWorker(takeWorker(heapMb), heapMb);
}

function runWorker<J extends WorkerJob>(job: J, limits: RunLimits, { onProgress, signal }: RunOptions): Promise<JobResult<J>> {
  return new Promise((resolve, reject) => {
    if (signal?.aborted) return reject(new SimulationCancelled());
    const worker = takeWorker(limits.heapMb);
    let settled = false;
    const finish = (reusable: boolean, outcome: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      signal?.removeEventListener("abort", cancel);
      worker.off("message", onMessage).off("error", onError).off("exit", onExit);
      if (reusable) returnWorker(worker, limits.heapMb);
      else void worker.terminate();
      outcome();
    };
    const timer = setTimeout(
      () => finish(false, () => reject(new SimulationLimitError(`the run took longer than ${limits.timeMs / 1000} s and was stopped`, "time"))),
      limits.timeMs,
    );
    const cancel = () => finish(false, () => reject(new SimulationCancelled()));
    signal?.addEventListener("abort", cancel, { once: true });

    const onMessage = (message: WorkerMessage) => {
      if (message.type === "progress") onProgress?.(message.fraction);
      else if (message.type === "result") finish(true, () => resolve(message.result as JobResult<J>));
      else finish(true, () => reject(new (rebuilt[message.name] ?? Error)(message.message)));
    };
    const onError = (error: Error) => {
      const outOfMemory = (error as NodeJS.ErrnoException).code === "ERR_WORKER_OUT_OF_MEMORY";
      finish(false, () => reject(outOfMemory ? new SimulationLimitError(`the run needed more than ${limits.heapMb} MB and was stopped`, "memory") : error));
    };
    const onExit = (code: number) => finish(false, () => reject(new Error(`the simulation worker stopped unexpectedly (exit code ${code})`)));
    worker.on("message", onMessage).on("error", onError).on("exit", onExit);
    worker.postMessage(job);
  });
}
