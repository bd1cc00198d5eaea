// Worker-thread entry: runs the jobs the parent sends and reports progress, the result or the
// error (by name, so the parent can rebuild the error class) for each.

import { parentPort } from "node:worker_threads";
import { compileEngineAhead } from "~/chem/kinetics/wasm/wasm-engine";
import type { FitProgress } from "~/chem/fit/types";
import { isTextJob, runJob, runRealizationJob, runTextJob, type SizeLimits, type WorkerJob } from "./job";
import { errorRecord, type ErrorRecord } from "./job-errors";

export type WorkerMessage =
  | { type: "ready" }
  | { type: "progress"; fraction: number; note?: FitProgress }
  | { type: "result"; result: unknown }
  | ({ type: "error" } & ErrorRecord);

export interface WorkerRequest {
  job: WorkerJob;
  limits: SizeLimits;
}

const post = (message: WorkerMessage) => parentPort?.postMessage(message);

// One job at a time, as the parent sends them; the worker then waits for the next. Every module is
// loaded by now: the parent starts the job's clock.
parentPort?.on("message", (request: WorkerRequest) => void run(request));
void compileEngineAhead(); // in the background while the thread waits for its first job
post({ type: "ready" });

async function run({ job, limits }: WorkerRequest) {
  try {
    const hooks = { onProgress: (fraction: number, note?: FitProgress) => post({ type: "progress", fraction, ...(note && { note }) }) };
    const result = job.kind === "realize" ? await runRealizationJob(job, hooks) : isTextJob(job) ? await runTextJob(job) : await runJob(job, hooks, limits);
    post({ type: "result", result });
  } catch (error) {
    post({ type: "error", ...errorRecord(error) });
  }
}
