// Who may start a worker job now: at most `concurrency` jobs at once, at most `running` of them per
// owner (a user, or a guest's address), and at most `queued` more waiting per owner. Jobs start in
// arrival order, skipping those whose owner is at their cap, so one user's burst cannot hold both
// workers while others wait. Kept apart from the worker threads so it can move to a job queue.

export interface AdmissionLimits {
  concurrency: number;
  /** Jobs one owner may run at once. */
  running: number;
  /** Jobs one owner may have waiting; one more is refused. */
  queued: number;
}

/** The owner already has as many jobs waiting as allowed. */
export class QueueFullError extends Error {
  override name = "QueueFullError";
  readonly code = "busy";
  constructor(
    message: string,
    /** Seconds after which a retry may be admitted. */
    readonly retryAfter: number,
  ) {
    super(message);
  }
}

export interface AdmitOptions {
  signal?: AbortSignal;
  /** Called with the 1-based place among all waiting jobs whenever it changes. */
  onQueued?: (position: number) => void;
}

interface Waiter {
  owner: string;
  start(): void;
  reportPosition(position: number): void;
}

export class Admission {
  private running = 0;
  private readonly runningBy = new Map<string, number>();
  private readonly waiting: Waiter[] = [];

  constructor(
    private readonly limits: AdmissionLimits,
    /** What a refused caller is told to wait, in seconds. */
    private readonly retryAfter: number,
  ) {}

  /** Resolves with the release function once the job may start; rejects with `cancelled()` if the signal aborts first. */
  admit(owner: string, { signal, onQueued }: AdmitOptions, cancelled: () => Error): Promise<() => void> {
    if (signal?.aborted) return Promise.reject(cancelled());
    if (this.mayStart(owner)) return Promise.resolve(this.start(owner));
    if (this.waiting.filter((w) => w.owner === owner).length >= this.limits.queued) {
      const jobs = this.limits.queued === 1 ? "job" : "jobs";
      return Promise.reject(
        new QueueFullError(`you already have ${this.limits.queued} ${jobs} waiting besides the one running; wait for them to finish or cancel one`, this.retryAfter),
      );
    }
    return new Promise((resolve, reject) => {
      let lastPosition = 0;
      const waiter: Waiter = {
        owner,
        start: () => {
          signal?.removeEventListener("abort", cancel);
          resolve(this.start(owner));
        },
        reportPosition: (position) => {
          if (position !== lastPosition) onQueued?.((lastPosition = position));
        },
      };
      const cancel = () => {
        this.waiting.splice(this.waiting.indexOf(waiter), 1);
        reject(cancelled());
        this.reportPositions();
      };
      signal?.addEventListener("abort", cancel, { once: true });
      this.waiting.push(waiter);
      waiter.reportPosition(this.waiting.length);
    });
  }

  private mayStart(owner: string): boolean {
    return this.running < this.limits.concurrency && (this.runningBy.get(owner) ?? 0) < this.limits.running;
  }

  private start(owner: string): () => void {
    this.running++;
    this.runningBy.set(owner, (this.runningBy.get(owner) ?? 0) + 1);
    let released = false;
    return () => {
      if (released) return;
      released = true;
      this.running--;
      const left = this.runningBy.get(owner)! - 1;
      if (left === 0) this.runningBy.delete(owner);
      else this.runningBy.set(owner, left);
      this.startWaiting();
    };
  }

  private startWaiting() {
    for (let k = 0; k < this.waiting.length && this.running < this.limits.concurrency; ) {
      const waiter = this.waiting[k];
      if (!this.mayStart(waiter.owner)) {
        k++;
        continue;
      }
      this.waiting.splice(k, 1);
      waiter.start();
    }
    this.reportPositions();
  }

  private reportPositions() {
    this.waiting.forEach((waiter, k) => waiter.reportPosition(k + 1));
  }
}
