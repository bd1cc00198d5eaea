// Versions of a mechanism: automatic ones when the structure settles into a new shape, named
// ones an editor asks for, and the marks a restore leaves. Each keeps the text, the Yjs state
// and the invariants, so History can compare versions without re-parsing.
import { and, desc, eq } from "drizzle-orm";
import { sameStructure, type StructureSummary } from "../../app/shared/version-diff";
import type { Db } from "../db/client";
import { snapshots, users } from "../db/schema";

export type SnapshotKind = "auto" | "named" | "restore";

export interface NewSnapshot {
  mechanismId: string;
  kind: SnapshotKind;
  name: string | null;
  source: string;
  state: Uint8Array;
  summary: StructureSummary;
  authorId: string | null;
}

export interface SnapshotListing {
  id: number;
  kind: SnapshotKind;
  name: string | null;
  at: Date;
  author: string | null;
  summary: StructureSummary;
}

export async function insertSnapshot(db: Db, snapshot: NewSnapshot): Promise<{ id: number; at: Date }> {
  const [row] = await db.insert(snapshots).values(snapshot).returning({ id: snapshots.id, at: snapshots.at });
  return row;
}

/** The newest `limit` versions, newest first. */
export async function listSnapshots(db: Db, mechanismId: string, limit = 500): Promise<SnapshotListing[]> {
  const rows = await db
    .select({ id: snapshots.id, kind: snapshots.kind, name: snapshots.name, at: snapshots.at, author: users.name, summary: snapshots.summary })
    .from(snapshots)
    .leftJoin(users, eq(users.id, snapshots.authorId))
    .where(eq(snapshots.mechanismId, mechanismId))
    .orderBy(desc(snapshots.at), desc(snapshots.id))
    .limit(limit);
  return rows.map((r) => ({ ...r, summary: r.summary as StructureSummary }));
}

/** One version with its text; null when it does not exist or belongs to another mechanism. */
export async function findSnapshot(db: Db, mechanismId: string, snapshotId: number) {
  const [row] = await db
    .select({ id: snapshots.id, kind: snapshots.kind, name: snapshots.name, at: snapshots.at, source: snapshots.source, summary: snapshots.summary, author: users.name })
    .from(snapshots)
    .leftJoin(users, eq(users.id, snapshots.authorId))
    .where(and(eq(snapshots.mechanismId, mechanismId), eq(snapshots.id, snapshotId)));
  return row ? { ...row, summary: row.summary as StructureSummary } : null;
}

export async function latestSummary(db: Db, mechanismId: string): Promise<StructureSummary | null> {
  const [row] = await db
    .select({ summary: snapshots.summary })
    .from(snapshots)
    .where(eq(snapshots.mechanismId, mechanismId))
    .orderBy(desc(snapshots.at), desc(snapshots.id))
    .limit(1);
  return (row?.summary as StructureSummary | undefined) ?? null;
}

/**
 * Decides when an automatic snapshot is due: the structure differs from the last stored version,
 * parses without errors (half-typed lines are not versions), and nothing changed for `quietMs`.
 */
export class AutoSnapshotPolicy {
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private lastStored: StructureSummary | null,
    private readonly options: { quietMs: number; due(): void },
  ) {}

  /** Called after every recompute with the structure of the current text. */
  observe(summary: StructureSummary) {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (!this.wants(summary)) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.options.due();
    }, this.options.quietMs);
  }

  wants(summary: StructureSummary): boolean {
    return summary.errors === 0 && !(this.lastStored && sameStructure(this.lastStored, summary));
  }

  get pending(): boolean {
    return this.timer !== null;
  }

  stored(summary: StructureSummary) {
    this.lastStored = summary;
  }

  dispose() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }
}
