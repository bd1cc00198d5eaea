// When a co-author's name flag shows: from the moment their caret moves (they type, click or
// select) until a few seconds without a move; then only their caret is left, so a flag never
// lingers over a text they walked away from. A presence message that repeats the same caret (the
// periodic renewal every client sends) is not activity.

/** How long a flag stays after its author's caret last moved. */
export const FLAG_IDLE_AFTER_MS = 4000;

export class PeerActivity {
  private readonly seen = new Map<number, { caret: string; at: number }>();

  constructor(private readonly idleAfterMs = FLAG_IDLE_AFTER_MS) {}

  /**
   * Takes every peer's caret as now known (any text that changes when the caret moves, by client
   * id): a new or moved caret is activity at `now`; peers no longer listed are forgotten.
   */
  see(carets: ReadonlyMap<number, string>, now: number): void {
    for (const id of this.seen.keys()) if (!carets.has(id)) this.seen.delete(id);
    for (const [id, caret] of carets) if (this.seen.get(id)?.caret !== caret) this.seen.set(id, { caret, at: now });
  }

  isActive(clientId: number, now: number): boolean {
    const last = this.seen.get(clientId);
    return last !== undefined && now - last.at < this.idleAfterMs;
  }

  /** Milliseconds from `now` until the next shown flag goes idle; null when none is shown. */
  nextIdleIn(now: number): number | null {
    let soonest: number | null = null;
    for (const { at } of this.seen.values()) {
      const left = at + this.idleAfterMs - now;
      if (left > 0 && (soonest === null || left < soonest)) soonest = left;
    }
    return soonest;
  }
}
