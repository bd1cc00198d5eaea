// The worker threads that analyse texts for every room of the process. A long analysis (a
// network of thousands of reactions) then never delays keystrokes relayed by the event loop.
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { typescriptWorkerSource } from "../typescript-worker";
import type { AnalysisEntries, AnalysisResponse } from "./analysis-entries";

const bootstrap = typescriptWorkerSource(new URL("./analysis-worker.ts", import.meta.url));

const WARM_UP_SOURCE = "A + B <=> C @ 1, 2\nC -> D + B @ 3\n";

/** A text that takes longer than this is given up on (the worker is replaced). */
const ANALYSIS_TIMEOUT_MS = 60_000;

interface Pending {
  resolve(outcome: AnalysisEntries): void;
  reject(error: Error): void;
  timer: NodeJS.Timeout;
}

class AnalysisThread {
  private worker: Worker | null = null;
  private readonly pending = new Map<number, Pending>();

  get load(): number {
    return this.pending.size;
  }

  run(id: number, source: string): Promise<AnalysisEntries> {
    const worker = this.ensure();
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => this.fail(new Error(`the analysis took longer than ${ANALYSIS_TIMEOUT_MS / 1000} s`)), ANALYSIS_TIMEOUT_MS);
      this.pending.set(id, { resolve, reject, timer });
      worker.postMessage({ id, source });
    });
  }

  /** Boots the thread and runs a small analysis, so the first room's first edit is not the one that pays for loading. */
  warm() {
    this.ensure().postMessage({ id: 0, source: WARM_UP_SOURCE });
  }

  stop() {
    void this.worker?.terminate();
    this.worker = null;
  }

  private ensure(): Worker {
    if (this.worker) return this.worker;
    const worker = new Worker(bootstrap, { eval: true });
    worker.unref();
    worker.on("message", (response: AnalysisResponse) => {
      if (this.worker !== worker) return;
      const pending = this.pending.get(response.id);
      if (!pending) return;
      this.pending.delete(response.id);
      clearTimeout(pending.timer);
      if ("failure" in response) pending.reject(new Error(response.failure));
      else pending.resolve(response);
    });
    worker.on("error", (error) => this.worker === worker && this.fail(error));
    worker.on("exit", () => this.worker === worker && this.fail(new Error("the analysis worker stopped")));
    this.worker = worker;
    return worker;
  }

  /** Rejects everything in flight and starts afresh on the next request. */
  private fail(error: Error) {
    this.stop();
    for (const pending of this.pending.values()) {
      clearTimeout(pending.timer);
      pending.reject(error);
    }
    this.pending.clear();
  }
}

export class AnalysisPool {
  private readonly threads: AnalysisThread[];
  /** Request ids start at 1; 0 is the warm-up, whose answer nobody waits for. */
  private nextId = 0;

  /** One thread fewer than the cores (at least one): the event loop keeps a core. */
  constructor(size = Math.max(1, Math.min(4, availableParallelism() - 1))) {
    this.threads = Array.from({ length: size }, () => new AnalysisThread());
    for (const thread of this.threads) thread.warm();
  }

  analyze(source: string): Promise<AnalysisEntries> {
    const thread = this.threads.reduce((idlest, t) => (t.load < idlest.load ? t : idlest));
    return thread.run(++this.nextId, source);
  }

  stop() {
    for (const thread of this.threads) thread.stop();
  }
}
