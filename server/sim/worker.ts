// Worker-thread entry: runs one dynamics job from workerData and reports progress, the result or
// the error (by name, so the parent can rebuild the error class) to the parent.

import { parentPort, workerData } from "node:worker_threads";
import { runAnalysisJob, runJob, runRealizationJob, type WorkerJob } from "./job";

export type WorkerMessage =
  | { type: "progress"; fraction: number }
  | { type: "result"; result: unknown }
  | { type: "error"; name: string; message: string };

const post = (message: WorkerMessage) => parentPort?.postMessage(message);

// Not top-level await: the worker is loaded through tsx's CommonJS hook (see run-in-worker.ts).
void (async () => {
  try {
    const job = workerData as WorkerJob;
    const hooks = { onProgress: (fraction: number) => post({ type: "progress", fraction }) };
    const result =
      job.kind === "realize" ? await runRealizationJob(job, hooks) : job.kind === "analyze" ? await runAnalysisJob(job) : runJob(job, hooks);
    post({ type: "result", result });
  } catch (error) {
    const { name, message } = error instanceof Error ? error : new Error(String(error));
    post({ type: "error", name, message });
  }
})();
