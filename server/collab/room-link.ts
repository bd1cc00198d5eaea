// One live room as one of several instances holding it. The update log stays the one truth: what
// another instance commits is announced by row id (room-bus.ts), read here and applied to the
// local copy, which relays it to its own members. One instance, the leader, also does the room's
// upkeep (analysis, automatic versions, compaction, the text mirror); the others try to lead
// whenever the leader lets go and, in case it dies unheard, every `retryMs`.
import type { RoomBus, RoomListener } from "./room-bus";
import type { RoomStore, StoredDocument } from "./store";

/** What the link asks of its room. */
export interface LinkedRoom {
  /** Applies rows other instances stored (relaying them to the local members). */
  applyStored(stored: StoredDocument): void;
  /** Applies other instances' presence. */
  applyPeerPresence(updates: Uint8Array[]): void;
  lead(): Promise<void>;
  follow(): void;
  readonly leading: boolean;
}

export class RoomLink implements RoomListener {
  private room: LinkedRoom | null = null;
  /** Announcements heard while the room was still loading: read once it is there. */
  private readonly early: [number, number][] = [];
  private reading: Promise<void> = Promise.resolve();
  private trying = false;
  /** This instance holds the room's lock (whatever became of the room since). */
  private holdsLock = false;
  private closed = false;
  private readonly retry: NodeJS.Timeout;

  constructor(
    private readonly bus: RoomBus,
    private readonly store: RoomStore,
    readonly mechanismId: string,
    retryMs: number,
  ) {
    // Joined before the room loads, so nothing committed after its load goes unheard.
    bus.join(mechanismId, this);
    this.retry = setInterval(() => void this.tryLead(), retryMs);
    this.retry.unref();
  }

  /** The loaded room: early announcements are read, and the link tries to lead at once. */
  async attach(room: LinkedRoom) {
    this.room = room;
    for (const [first, last] of this.early.splice(0)) this.committed(first, last);
    await this.tryLead();
  }

  committed(first: number, last: number) {
    if (!this.room) return void this.early.push([first, last]);
    this.read(() => this.store.committedUpdates(this.mechanismId, first, last));
  }

  presence(updates: Uint8Array[]) {
    this.room?.applyPeerPresence(updates);
  }

  leaderLeft() {
    void this.tryLead();
  }

  linkLost() {
    this.holdsLock = false;
    this.room?.follow();
  }

  linkRestored() {
    this.read(() => this.store.loadDocument(this.mechanismId));
    void this.tryLead();
  }

  /** Lets go: the room has flushed what it leads for; others are told to take over. */
  async close() {
    this.closed = true;
    clearInterval(this.retry);
    this.bus.leave(this.mechanismId);
    if (this.holdsLock) await this.bus.resign(this.mechanismId);
    this.holdsLock = false;
  }

  /** Reads in order of announcement; a failed read falls back to reading the whole room. */
  private read(rows: () => Promise<StoredDocument>) {
    this.reading = this.reading.then(async () => {
      for (let attempt = 1; !this.closed; attempt++) {
        try {
          const stored = await (attempt === 1 ? rows() : this.store.loadDocument(this.mechanismId));
          if (!this.closed) this.room?.applyStored(stored);
          return;
        } catch (error) {
          if (attempt === 1 || attempt % 20 === 0) console.error(`[collab] reading others' edits of ${this.mechanismId} failed (attempt ${attempt}): ${(error as Error).message}`);
          await new Promise((resolve) => setTimeout(resolve, Math.min(250 * attempt, 5000)));
        }
      }
    });
  }

  private async tryLead() {
    const room = this.room;
    if (!room || this.holdsLock || this.trying || this.closed) return;
    this.trying = true;
    try {
      // Taking the lock twice on one connection would need two unlocks: hence `holdsLock`.
      if (!(await this.bus.tryLead(this.mechanismId))) return;
      this.holdsLock = true;
      if (this.closed) {
        this.holdsLock = false;
        return void (await this.bus.resign(this.mechanismId));
      }
      console.log(`[collab] ${this.bus.instance} leads ${this.mechanismId}`);
      await room.lead();
    } catch (error) {
      console.warn(`[collab] trying to lead ${this.mechanismId}: ${(error as Error).message}`);
    } finally {
      this.trying = false;
    }
  }
}
