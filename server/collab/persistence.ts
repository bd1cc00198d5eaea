// The shared document in PostgreSQL: an append-only log of accepted updates (doc_updates) and a
// compacted state (doc_states). An update is *acknowledged* once its row has committed (and
// PostgreSQL has flushed it to disk); the room relays an update to the other members only after
// that, so anything a member received as an edit survives a crash of the server. (A member joining
// meanwhile gets the room's state, which may be a few milliseconds ahead of the log; the author's
// client still holds those edits and sends them again when it reconnects.)
//
// Several app instances may hold one document (see room-link.ts): each insert announces its rows
// on the `mechweave_rooms` channel in the same statement, so the announcement goes out exactly when
// the rows commit, and the other instances read the rows by id.
import { and, asc, between, eq, gte, inArray, lte, sql } from "drizzle-orm";
import type { Db } from "../db/client";
import { docStates, docUpdates } from "../db/schema";
import { MechanismGone, type LiveDocument, type StoredDocument } from "./store";

/** The one channel every instance listens on for committed rows (room-bus.ts reads it). */
export const ROOMS_CHANNEL = "mechweave_rooms";

export async function loadDocument(db: Db, mechanismId: string): Promise<StoredDocument> {
  const [state] = await db.select({ state: docStates.state }).from(docStates).where(eq(docStates.mechanismId, mechanismId));
  // Every remaining row is applied, not only those after `throughUpdate`: applying an update twice
  // is harmless, skipping one is not.
  const rows = await db.select({ id: docUpdates.id, update: docUpdates.update }).from(docUpdates).where(eq(docUpdates.mechanismId, mechanismId)).orderBy(asc(docUpdates.id));
  return { state: state?.state ?? null, updates: rows.map((r) => r.update), ids: rows.map((r) => r.id) };
}

/**
 * The rows one announcement names (ids `first`…`last` of this document; rows of other writers in
 * that span come along and apply harmlessly), with the compacted state when a compaction has
 * already covered part of the span and deleted its rows.
 */
export async function committedUpdates(db: Db, mechanismId: string, first: number, last: number): Promise<StoredDocument> {
  const [rows, [state]] = await Promise.all([
    db
      .select({ id: docUpdates.id, update: docUpdates.update })
      .from(docUpdates)
      .where(and(eq(docUpdates.mechanismId, mechanismId), between(docUpdates.id, first, last)))
      .orderBy(asc(docUpdates.id)),
    db
      .select({ state: docStates.state })
      .from(docStates)
      .where(and(eq(docStates.mechanismId, mechanismId), gte(docStates.throughUpdate, first))),
  ]);
  return { state: state?.state ?? null, updates: rows.map((r) => r.update), ids: rows.map((r) => r.id) };
}

const FOREIGN_KEY_VIOLATION = "23503";

function isForeignKeyViolation(error: unknown): boolean {
  const cause = (error as { cause?: { code?: string }; code?: string }) ?? {};
  return (cause.code ?? cause.cause?.code) === FOREIGN_KEY_VIOLATION;
}

/**
 * One multi-row INSERT that announces its rows (`{ room, from, first, last }`, never the bytes:
 * a notification holds at most 8 KB) in the same statement: the batch commits and is announced
 * as a whole or not at all. Resolves with the new rows' ids.
 */
export async function appendUpdates(db: Db, mechanismId: string, updates: Uint8Array[], instance: string): Promise<number[]> {
  if (updates.length === 0) return [];
  try {
    const { rows } = await db.execute<{ ids: string[] }>(sql`
      with inserted as (
        insert into doc_updates (mechanism_id, update)
        select ${mechanismId}, u.update from unnest(${sql.param(updates)}::bytea[]) with ordinality as u(update, n) order by u.n
        returning id)
      select array_agg(id order by id) as ids,
             pg_notify(${ROOMS_CHANNEL}, json_build_object('room', ${mechanismId}::text, 'from', ${instance}::text, 'first', min(id), 'last', max(id))::text)
      from inserted`);
    return rows[0].ids.map(Number);
  } catch (error) {
    // The row's mechanism is gone: deleted under its live room.
    if (isForeignKeyViolation(error)) throw new MechanismGone(`mechanism ${mechanismId} was deleted`, { cause: error });
    throw error;
  }
}

/**
 * Stores the live document as the compacted state and deletes the logged rows it covers, in one
 * transaction. The state covers every committed row up to the newest id read here: the live
 * document already holds its own instance's rows (applied before they were inserted) and those
 * announced to it; rows another instance committed but whose announcement has not arrived yet
 * are read and applied first. Rows appended meanwhile get higher ids (or are not yet visible)
 * and stay. Encoding the live document costs a millisecond, where replaying the log cost the
 * event loop a hundred, and appends never wait for it.
 */
/** Rows one compaction takes at most (a query's parameters are limited); the next takes the rest. */
const MAX_COMPACTED_ROWS = 20_000;

export async function compactDocument(db: Db, mechanismId: string, live: LiveDocument): Promise<number> {
  return db.transaction(async (tx) => {
    // Compactions of one document queue here, even before it has a state row to lock (two
    // instances may both lead for a moment; see room-link.ts); each then reads what the last stored.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`mechweave-compact:${mechanismId}`}, 0))`);
    const ids = (
      await tx.select({ id: docUpdates.id }).from(docUpdates).where(eq(docUpdates.mechanismId, mechanismId)).orderBy(asc(docUpdates.id)).limit(MAX_COMPACTED_ROWS)
    ).map((r) => r.id);
    if (ids.length === 0) return 0;
    const throughUpdate = ids[ids.length - 1];
    const unheld = ids.filter((id) => !live.holds(id));
    const missing = unheld.length === 0 ? [] : await tx.select({ update: docUpdates.update }).from(docUpdates).where(and(eq(docUpdates.mechanismId, mechanismId), inArray(docUpdates.id, unheld))).orderBy(asc(docUpdates.id));
    // Encoding a loaded document (garbage collection on) drops deleted content, which merging
    // the raw updates would keep.
    const state = live.encode(missing.map((r) => r.update), throughUpdate);
    await tx
      .insert(docStates)
      .values({ mechanismId, state, throughUpdate })
      .onConflictDoUpdate({ target: docStates.mechanismId, set: { state, throughUpdate, at: new Date() } });
    // Exactly the rows read: one with a lower id may commit after that read, and is not in the state.
    const deleted = await tx.delete(docUpdates).where(and(eq(docUpdates.mechanismId, mechanismId), lte(docUpdates.id, throughUpdate), inArray(docUpdates.id, ids)));
    return deleted.rowCount ?? 0;
  });
}
