// The worker threads that analyse texts for every room of the process. A long analysis (a
// network of thousands of reactions) then never delays keystrokes relayed by the event loop.
import { Worker } from "node:worker_threads";
import { workerScript } from "../worker-script";
import type { AnalysisEntries, AnalysisResponse, Analyzer } from "./analysis-entries";

const entry = workerScript(new URL("./analysis-worker.ts", import.meta.url), "analysis-thread.js");

const WARM_UP_SOURCE = "A + B <=> C @ 1, 2\nC -> D + B @ 3\n";

/** An analysis stopped by the time limit; the room shows its message instead of a report. */
export class AnalysisTimeout extends Error {
  override name = "AnalysisTimeout";
}

interface Pending {
  source: string;
  resolve(outcome: AnalysisEntries): void;
  reject(error: Error): void;
}

class AnalysisThread {
  private worker: Worker | null = null;
  /** In the order sent: the worker answers one at a time, so the first is the one running. */
  private readonly pending = new Map<number, Pending>();
  /** The time limit of the request now running (the first pending), not of those waiting behind it. */
  private timer: NodeJS.Timeout | null = null;
  /** The worker has loaded its modules; before that its boot, not an analysis, takes the time. */
  private loaded = false;

  constructor(private readonly timeoutMs: number) {}

  get load(): number {
    return this.pending.size;
  }

  run(id: number, source: string): Promise<AnalysisEntries> {
    return new Promise((resolve, reject) => {
      this.pending.set(id, { source, resolve, reject });
      this.ensure().postMessage({ id, source });
      this.armTimer();
    });
  }

  /** Boots the thread and runs a small analysis, so the first room's first edit is not the one that pays for loading. */
  warm() {
    this.ensure().postMessage({ id: 0, source: WARM_UP_SOURCE });
  }

  stop() {
    void this.worker?.terminate();
    this.worker = null;
    this.loaded = false;
    this.disarmTimer();
  }

  private ensure(): Worker {
    if (this.worker) return this.worker;
    const worker = new Worker(entry.script, { eval: entry.eval });
    worker.unref();
    worker.on("message", (response: AnalysisResponse | "ready") => {
      if (this.worker !== worker) return;
      if (response === "ready") {
        this.loaded = true;
        return this.armTimer();
      }
      const pending = this.pending.get(response.id);
      if (!pending) return;
      this.pending.delete(response.id);
      this.disarmTimer();
      this.armTimer();
      if ("failure" in response) pending.reject(new Error(response.failure));
      else pending.resolve(response);
    });
    worker.on("error", (error) => this.worker === worker && this.fail(error));
    worker.on("exit", () => this.worker === worker && this.fail(new Error("the analysis worker stopped")));
    this.worker = worker;
    return worker;
  }

  private armTimer() {
    if (this.timer || !this.loaded || this.pending.size === 0) return;
    this.timer = setTimeout(() => this.timeOut(), this.timeoutMs);
  }

  private disarmTimer() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  /** Stops the worker on the running text; the texts waiting behind it go to a fresh worker. */
  private timeOut() {
    this.timer = null;
    const [id, running] = this.pending.entries().next().value!;
    this.pending.delete(id);
    const waiting = [...this.pending.entries()];
    this.pending.clear();
    this.stop();
    running.reject(new AnalysisTimeout(`The analysis of this text took longer than ${this.timeoutMs / 1000} s and was stopped.`));
    for (const [waitingId, { source, resolve, reject }] of waiting) this.run(waitingId, source).then(resolve, reject);
  }

  /** Rejects everything in flight and starts afresh on the next request. */
  private fail(error: Error) {
    this.stop();
    for (const pending of this.pending.values()) pending.reject(error);
    this.pending.clear();
  }
}

export class AnalysisPool implements Analyzer {
  private readonly threads: AnalysisThread[];
  /** Request ids start at 1; 0 is the warm-up, whose answer nobody waits for. */
  private nextId = 0;

  /** `size` threads, from the process's worker budget (see worker-budget.ts). */
  constructor(timeoutMs: number, size: number) {
    this.threads = Array.from({ length: size }, () => new AnalysisThread(timeoutMs));
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
