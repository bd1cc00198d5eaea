// Worker-thread entry: runs the jobs the parent sends and reports progress, the result or the
// error (by name, so the parent can rebuild the error class) for each.

import { parentPort } from "node:worker_threads";
import { runAnalysisJob, runJob, runRealizationJob, type WorkerJob } from "./job";

export type WorkerMessage =
  | { type: "progress"; fraction: number }
  | { type: "result"; result: unknown }
  | { type: "error"; name: string; message: string };

const post = (message: WorkerMessage) => parentPort?.postMessage(message);

// One job at a time, as the parent sends them; the worker then waits for the next.
parentPort?.on("message", (job: WorkerJob) => void run(job));

async function run(job: WorkerJob) {
  try {
    const hooks = { onProgress: (fraction: number) => post({ type: "progress", fraction }) };
    const result =
      job.kind === "realize" ? await runRealizationJob(job, hooks) : job.kind === "analyze" ? await runAnalysisJob(job) : runJob(job, hooks);
    post({ type: "result", result });
  } catch (error) {
    const { name, message } = error instanceof Error ? error : new Error(String(error));
    post({ type: "error", name, message });
  }
}
