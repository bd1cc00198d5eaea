// The shared document in PostgreSQL: an append-only log of accepted updates (doc_updates) and a
// compacted state (doc_states). An update is *acknowledged* once its row has committed (and
// PostgreSQL has flushed it to disk); the room relays an update to the other members only after
// that, so anything a member received as an edit survives a crash of the server. (A member joining
// meanwhile gets the room's state, which may be a few milliseconds ahead of the log; the author's
// client still holds those edits and sends them again when it reconnects.)
import { and, asc, eq, lte, max } from "drizzle-orm";
import type { Db } from "../db/client";
import { docStates, docUpdates } from "../db/schema";

export interface StoredDocument {
  state: Uint8Array | null;
  updates: Uint8Array[];
}

export async function loadDocument(db: Db, mechanismId: string): Promise<StoredDocument> {
  const [state] = await db.select({ state: docStates.state }).from(docStates).where(eq(docStates.mechanismId, mechanismId));
  // Every remaining row is applied, not only those after `throughUpdate`: applying an update twice
  // is harmless, skipping one is not.
  const rows = await db.select({ update: docUpdates.update }).from(docUpdates).where(eq(docUpdates.mechanismId, mechanismId)).orderBy(asc(docUpdates.id));
  return { state: state?.state ?? null, updates: rows.map((r) => r.update) };
}

/** One multi-row INSERT: the batch commits as a whole or not at all. */
export async function appendUpdates(db: Db, mechanismId: string, updates: Uint8Array[]): Promise<void> {
  if (updates.length === 0) return;
  await db.insert(docUpdates).values(updates.map((update) => ({ mechanismId, update })));
}

/**
 * Stores `encodeState()` (the live document) as the compacted state and deletes the logged rows it
 * covers, in one transaction. Every row was applied to the live document before it was inserted,
 * so a state encoded after reading the newest row id covers every row up to that id; rows appended
 * meanwhile get higher ids and stay. Encoding the live document costs a millisecond, where
 * replaying the log cost the event loop a hundred, and appends never wait for it.
 */
export async function compactDocument(db: Db, mechanismId: string, encodeState: () => Uint8Array): Promise<number> {
  return db.transaction(async (tx) => {
    // The row lock serialises compactions of one document.
    await tx.select({ id: docStates.mechanismId }).from(docStates).where(eq(docStates.mechanismId, mechanismId)).for("update");
    const [{ throughUpdate }] = await tx.select({ throughUpdate: max(docUpdates.id) }).from(docUpdates).where(eq(docUpdates.mechanismId, mechanismId));
    if (throughUpdate === null) return 0;
    // Encoding a loaded document (garbage collection on) drops deleted content, which merging
    // the raw updates would keep.
    const state = encodeState();
    await tx
      .insert(docStates)
      .values({ mechanismId, state, throughUpdate })
      .onConflictDoUpdate({ target: docStates.mechanismId, set: { state, throughUpdate, at: new Date() } });
    const deleted = await tx.delete(docUpdates).where(and(eq(docUpdates.mechanismId, mechanismId), lte(docUpdates.id, throughUpdate)));
    return deleted.rowCount ?? 0;
  });
}

export interface LoggedUpdate<Origin> {
  update: Uint8Array;
  origin: Origin;
}

const MAX_BATCH = 500;
const RETRY_MS = 500;
const FOREIGN_KEY_VIOLATION = "23503";

function isMechanismGone(error: unknown): boolean {
  const cause = (error as { cause?: { code?: string }; code?: string }) ?? {};
  return (cause.code ?? cause.cause?.code) === FOREIGN_KEY_VIOLATION;
}

/**
 * The write queue of one document: appends in arrival order, batching whatever arrived while
 * the previous insert was in flight (group commit), retrying while the database is away.
 */
export class UpdateLog<Origin> {
  private pending: LoggedUpdate<Origin>[] = [];
  private chain: Promise<void> = Promise.resolve();
  private drainScheduled = false;
  private lost = false;
  appendedSinceCompaction = 0;

  constructor(
    private readonly db: Db,
    private readonly mechanismId: string,
    private readonly hooks: {
      committed(batch: LoggedUpdate<Origin>[]): void;
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
      if (!(await this.store(batch))) return;
      this.appendedSinceCompaction += batch.length;
      this.hooks.committed(batch);
    }
  }

  private async store(batch: LoggedUpdate<Origin>[]): Promise<boolean> {
    for (let attempt = 1; ; attempt++) {
      try {
        await appendUpdates(this.db, this.mechanismId, batch.map((e) => e.update));
        return true;
      } catch (error) {
        if (isMechanismGone(error)) {
          this.lost = true;
          this.pending = [];
          this.hooks.mechanismGone();
          return false;
        }
        if (attempt === 1 || attempt % 20 === 0) {
          console.error(`[collab] storing ${batch.length} update(s) of ${this.mechanismId} failed (attempt ${attempt}), retrying: ${(error as Error).message}`);
        }
        await new Promise((resolve) => setTimeout(resolve, Math.min(RETRY_MS * attempt, 5000)));
      }
    }
  }
}
