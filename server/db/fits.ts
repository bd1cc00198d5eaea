// Data sets and fits of a mechanism. Every query names the mechanism, so an id that belongs to
// another mechanism reads as missing: routes check the caller's role on the mechanism, and these
// queries keep each id inside it.
import { and, count, desc, eq, inArray, sql } from "drizzle-orm";
import { MAX_DATA_SETS_PER_MECHANISM } from "~/chem/limits";
import type { Db } from "./client";
import { dataSets, fits, snapshots, users } from "./schema";

export interface DataSetListing {
  id: string;
  name: string;
  bytes: number;
  uploadedBy: string | null;
  createdAt: Date;
}

/** A refusal a person can act on (too many data sets, an id that is not there); routes answer it as 4xx. */
export class FitStorageError extends Error {
  override name = "FitStorageError";
  constructor(
    message: string,
    readonly code: "not_found" | "too_large" | "bad_input",
  ) {
    super(message);
  }
}

export async function listDataSets(db: Db, mechanismId: string): Promise<DataSetListing[]> {
  return db
    .select({ id: dataSets.id, name: dataSets.name, bytes: dataSets.bytes, uploadedBy: users.name, createdAt: dataSets.createdAt })
    .from(dataSets)
    .leftJoin(users, eq(users.id, dataSets.uploadedBy))
    .where(eq(dataSets.mechanismId, mechanismId))
    .orderBy(desc(dataSets.createdAt), desc(dataSets.id));
}

/** Stores a data set whose CSV was read already; refuses past MAX_DATA_SETS_PER_MECHANISM. */
export async function insertDataSet(db: Db, mechanismId: string, userId: string, input: { name: string; csv: string }): Promise<DataSetListing> {
  return db.transaction(async (tx) => {
    // The mechanism's row lock orders concurrent uploads, so the count below stays true.
    await tx.execute(sql`SELECT 1 FROM mechanisms WHERE id = ${mechanismId} FOR UPDATE`);
    const [{ stored }] = await tx.select({ stored: count() }).from(dataSets).where(eq(dataSets.mechanismId, mechanismId));
    if (stored >= MAX_DATA_SETS_PER_MECHANISM) throw new FitStorageError(`A mechanism keeps at most ${MAX_DATA_SETS_PER_MECHANISM} data sets; delete one first.`, "too_large");
    const bytes = Buffer.byteLength(input.csv, "utf8");
    const [row] = await tx.insert(dataSets).values({ mechanismId, name: input.name, csv: input.csv, bytes, uploadedBy: userId }).returning();
    const [uploader] = await tx.select({ name: users.name }).from(users).where(eq(users.id, userId));
    return { id: row.id, name: row.name, bytes: row.bytes, uploadedBy: uploader?.name ?? null, createdAt: row.createdAt };
  });
}

/** The data sets' names and CSV texts in the order asked; a FitStorageError names an id that is not the mechanism's. */
export async function dataSetTexts(db: Db, mechanismId: string, ids: string[]): Promise<{ id: string; name: string; csv: string }[]> {
  if (ids.length === 0) return [];
  const rows = await db
    .select({ id: dataSets.id, name: dataSets.name, csv: dataSets.csv })
    .from(dataSets)
    .where(and(eq(dataSets.mechanismId, mechanismId), inArray(dataSets.id, ids)));
  const byId = new Map(rows.map((row) => [row.id, row]));
  return ids.map((id) => {
    const row = byId.get(id);
    if (!row) throw new FitStorageError(`No data set ${id} belongs to this mechanism.`, "not_found");
    return row;
  });
}

/** True when a data set was deleted; false when the mechanism has none by that id. */
export async function deleteDataSet(db: Db, mechanismId: string, dataSetId: string): Promise<boolean> {
  const deleted = await db.delete(dataSets).where(and(eq(dataSets.mechanismId, mechanismId), eq(dataSets.id, dataSetId))).returning({ id: dataSets.id });
  return deleted.length > 0;
}

export interface NewFit {
  mechanismId: string;
  source: string;
  ranBy: string;
  dataSetIds: string[];
  settings: unknown;
}

/** Records a fit as running, tied to the newest version of the mechanism. */
export async function insertFit(db: Db, fit: NewFit): Promise<{ id: string; snapshotId: number | null; createdAt: Date }> {
  const [latest] = await db
    .select({ id: snapshots.id })
    .from(snapshots)
    .where(eq(snapshots.mechanismId, fit.mechanismId))
    .orderBy(desc(snapshots.at), desc(snapshots.id))
    .limit(1);
  const [row] = await db
    .insert(fits)
    .values({ ...fit, snapshotId: latest?.id ?? null, status: "running" })
    .returning({ id: fits.id, snapshotId: fits.snapshotId, createdAt: fits.createdAt });
  return row;
}

export async function finishFit(db: Db, mechanismId: string, fitId: string, outcome: { result: unknown } | { error: string }): Promise<void> {
  const values = "result" in outcome ? { status: "done" as const, result: outcome.result } : { status: "failed" as const, error: outcome.error };
  await db
    .update(fits)
    .set({ ...values, finishedAt: new Date() })
    .where(and(eq(fits.mechanismId, mechanismId), eq(fits.id, fitId)));
}

const fitColumns = {
  id: fits.id,
  snapshotId: fits.snapshotId,
  ranBy: users.name,
  dataSetIds: fits.dataSetIds,
  settings: fits.settings,
  status: fits.status,
  result: fits.result,
  error: fits.error,
  createdAt: fits.createdAt,
  finishedAt: fits.finishedAt,
};

/** The newest fits first, with their results. */
export async function listFits(db: Db, mechanismId: string, limit = 50) {
  return db
    .select(fitColumns)
    .from(fits)
    .leftJoin(users, eq(users.id, fits.ranBy))
    .where(eq(fits.mechanismId, mechanismId))
    .orderBy(desc(fits.createdAt), desc(fits.id))
    .limit(limit);
}

/** One fit with the text it ran on; null when it is not this mechanism's. */
export async function findFit(db: Db, mechanismId: string, fitId: string) {
  const [row] = await db
    .select({ ...fitColumns, source: fits.source })
    .from(fits)
    .leftJoin(users, eq(users.id, fits.ranBy))
    .where(and(eq(fits.mechanismId, mechanismId), eq(fits.id, fitId)));
  return row ?? null;
}
