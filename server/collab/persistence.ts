// The shared document in PostgreSQL: an append-only log of accepted updates (doc_updates) and a
// compacted state (doc_states). An update is *acknowledged* once its row has committed (and
// PostgreSQL has flushed it to disk); the room relays an update to the other members only after
// that, so anything a member received as an edit survives a crash of the server. (A member joining
// meanwhile gets the room's state, which may be a few milliseconds ahead of the log; the author's
// client still holds those edits and sends them again when it reconnects.)
import { and, asc, eq, inArray } from "drizzle-orm";
import * as Y from "yjs";
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
 * Merges the state and every logged update into a new state and deletes exactly the merged rows,
 * in one transaction. Callers serialise this with appends of the same document (UpdateLog.exclusive).
 */
export async function compactDocument(db: Db, mechanismId: string): Promise<number> {
  return db.transaction(async (tx) => {
    const [current] = await tx.select().from(docStates).where(eq(docStates.mechanismId, mechanismId)).for("update");
    const rows = await tx.select().from(docUpdates).where(eq(docUpdates.mechanismId, mechanismId)).orderBy(asc(docUpdates.id));
    if (rows.length === 0) return 0;
    const doc = new Y.Doc();
    if (current) Y.applyUpdate(doc, current.state);
    for (const row of rows) Y.applyUpdate(doc, row.update);
    // Encoding a loaded document (garbage collection on) drops deleted content, which merging
    // the raw updates would keep.
    const state = Y.encodeStateAsUpdate(doc);
    doc.destroy();
    const throughUpdate = rows[rows.length - 1].id;
    await tx
      .insert(docStates)
      .values({ mechanismId, state, throughUpdate })
      .onConflictDoUpdate({ target: docStates.mechanismId, set: { state, throughUpdate, at: new Date() } });
    const ids = rows.map((r) => r.id);
    for (let i = 0; i < ids.length; i += 5000) {
      await tx.delete(docUpdates).where(and(eq(docUpdates.mechanismId, mechanismId), inArray(docUpdates.id, ids.slice(i, i + 5000))));
    }
    return rows.length;
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

  /** Runs `task` between batches, never concurrently with an insert of this document. */
  exclusive<T>(task: () => Promise<T>): Promise<T> {
    const run = this.chain.then(task);
    this.chain = run.then(
      () => undefined,
      () => undefined,
    );
    return run;
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
