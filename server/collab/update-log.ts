// Every accepted update of a live document is stored before it is relayed (persistence.ts says why).
import { MechanismGone, type RoomStore } from "./store";

/**
 * The origin of rows another instance stored (room-link.ts reads them): applied and relayed, never
 * logged again.
 */
export const peerOrigin = Symbol("mechweave-peer");

export interface LoggedUpdate<Origin> {
  update: Uint8Array;
  origin: Origin;
}

const MAX_BATCH = 500;
const RETRY_MS = 500;

/**
 * The write queue of one document: appends in arrival order, batching whatever arrived while
 * the previous insert was in flight (group commit), retrying while the database is away.
 */
export class UpdateLog<Origin> {
  private pending: LoggedUpdate<Origin>[] = [];
  private chain: Promise<void> = Promise.resolve();
  private drainScheduled = false;
  private lost = false;

  constructor(
    private readonly store: RoomStore,
    private readonly mechanismId: string,
    private readonly hooks: {
      /** The batch is stored, as the rows `ids`. */
      committed(batch: LoggedUpdate<Origin>[], ids: number[]): void;
      /** The mechanism was deleted under the live room: nothing more can be stored. */
      mechanismGone(): void;
    },
  ) {}

  append(entry: LoggedUpdate<Origin>) {
    if (this.lost) return;
    this.pending.push(entry);
    if (this.drainScheduled) return;
    this.drainScheduled = true;
    this.chain = this.chain.then(() => this.drain());
  }

  /** Resolves once everything appended before the call has committed. */
  flushed(): Promise<void> {
    return this.chain;
  }

  private async drain() {
    this.drainScheduled = false;
    while (this.pending.length > 0 && !this.lost) {
      const batch = this.pending.splice(0, MAX_BATCH);
      const ids = await this.stored(batch);
      if (!ids) return;
      this.hooks.committed(batch, ids);
    }
  }

  private async stored(batch: LoggedUpdate<Origin>[]): Promise<number[] | null> {
    for (let attempt = 1; ; attempt++) {
      try {
        return await this.store.appendUpdates(this.mechanismId, batch.map((e) => e.update));
      } catch (error) {
        if (error instanceof MechanismGone) {
          this.lost = true;
          this.pending = [];
          this.hooks.mechanismGone();
          return null;
        }
        if (attempt === 1 || attempt % 20 === 0) {
          console.error(`[collab] storing ${batch.length} update(s) of ${this.mechanismId} failed (attempt ${attempt}), retrying: ${(error as Error).message}`);
        }
        await new Promise((resolve) => setTimeout(resolve, Math.min(RETRY_MS * attempt, 5000)));
      }
    }
  }
}
