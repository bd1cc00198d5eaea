// How many cores the process gives to worker threads, decided once at boot (server/main.ts) and
// shared by the two kinds of worker: the rooms' analysis threads (collab/analysis-pool.ts) and
// the jobs of the HTTP API (sim/run-in-worker.ts). Each sizes itself from the same budget.
import { availableParallelism } from "node:os";
import { z } from "zod";

const cores = z.number().int().min(1, "The worker budget needs at least one core.");

export class WorkerBudget {
  readonly cores: number;

  /** By default every core but one, which the event loop keeps. */
  constructor(size: number = Math.max(1, availableParallelism() - 1)) {
    this.cores = cores.parse(size);
  }

  /** Threads analysing the rooms' texts: one a core, at most four (a room's analysis is short). */
  get analysisThreads(): number {
    return Math.min(4, this.cores);
  }

  /**
   * API jobs running at once in each lane (reading text, dynamics): one a core, but never fewer
   * than two, so one long run cannot hold up everybody.
   */
  get jobsAtOnce(): number {
    return Math.max(2, this.cores);
  }
}
