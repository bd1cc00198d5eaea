// Worker-thread entry: runs one dynamics job from workerData and reports progress, the result or
// the error (by name, so the parent can rebuild the error class) to the parent.

import { parentPort, workerData } from "node:worker_threads";
import { runJob, type DynamicsJob } from "./job";

export type WorkerMessage =
  | { type: "progress"; fraction: number }
  | { type: "result"; result: unknown }
  | { type: "error"; name: string; message: string };

const post = (message: WorkerMessage) => parentPort?.postMessage(message);

try {
  const result = runJob(workerData as DynamicsJob, { onProgress: (fraction) => post({ type: "progress", fraction }) });
  post({ type: "result", result });
} catch (error) {
  const { name, message } = error instanceof Error ? error : new Error(String(error));
  post({ type: "error", name, message });
}
