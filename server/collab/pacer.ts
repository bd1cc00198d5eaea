// Sending to a large room: at most one message per member per interval, however many people
// type. The first request after a quiet spell runs at once, so a lone typist waits for nothing;
// requests during the interval are gathered and run together when it ends.
export class Pacer {
  private timer: NodeJS.Timeout | null = null;
  private lastRun = Number.NEGATIVE_INFINITY;

  constructor(
    /** Read at each request, so it may follow how long the work took. */
    private readonly intervalMs: number | (() => number),
    private readonly run: () => void,
  ) {}

  request() {
    if (this.timer) return;
    const interval = typeof this.intervalMs === "number" ? this.intervalMs : this.intervalMs();
    const wait = this.lastRun + interval - performance.now();
    if (wait <= 0) this.runNow();
    else
      this.timer = setTimeout(() => {
        this.timer = null;
        this.runNow();
      }, wait);
  }

  dispose() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  private runNow() {
    this.lastRun = performance.now();
    this.run();
  }
}
