// The shared document in PostgreSQL: an append-only log of accepted updates (doc_updates) and a
// compacted state (doc_states). An update is *acknowledged* once its row has committed (and
// PostgreSQL has flushed it to disk); the room relays an update to the other members only after
// that, so anything a member received as an edit survives a crash of the server. (A member joining
// meanwhile gets the room's state, which may be a few milliseconds ahead of the log; the author's
// client still holds those edits and sends them again when it reconnects.)
import { and, asc, eq, lte, max } from "drizzle-orm";
import type { Db } from "../db/client";
import { docStates, docUpdates } from "../db/schema";
import { MechanismGone, type StoredDocument } from "./store";

export async function loadDocument(db: Db, mechanismId: string): Promise<StoredDocument> {
  const [state] = await db.select({ state: docStates.state }).from(docStates).where(eq(docStates.mechanismId, mechanismId));
  // Every remaining row is applied, not only those after `throughUpdate`: applying an update twice
  // is harmless, skipping one is not.
  const rows = await db.select({ update: docUpdates.update }).from(docUpdates).where(eq(docUpdates.mechanismId, mechanismId)).orderBy(asc(docUpdates.id));
  return { state: state?.state ?? null, updates: rows.map((r) => r.update) };
}

const FOREIGN_KEY_VIOLATION = "23503";

function isForeignKeyViolation(error: unknown): boolean {
  const cause = (error as { cause?: { code?: string }; code?: string }) ?? {};
  return (cause.code ?? cause.cause?.code) === FOREIGN_KEY_VIOLATION;
}

/** One multi-row INSERT: the batch commits as a whole or not at all. */
export async function appendUpdates(db: Db, mechanismId: string, updates: Uint8Array[]): Promise<void> {
  if (updates.length === 0) return;
  try {
    await db.insert(docUpdates).values(updates.map((update) => ({ mechanismId, update })));
  } catch (error) {
    // The row's mechanism is gone: deleted under its live room.
    if (isForeignKeyViolation(error)) throw new MechanismGone(`mechanism ${mechanismId} was deleted`, { cause: error });
    throw error;
  }
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
