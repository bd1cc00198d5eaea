// The rooms' and hub's storage in PostgreSQL: the shared document's tables (persistence.ts), the
// mechanism row, versions, access and credentials.
import { asc, gt, max } from "drizzle-orm";
import type { Db } from "../db/client";
import { findMechanism, roleOf, saveSource } from "../db/mechanisms";
import { roleChanges } from "../db/schema";
import { endedCredentials } from "./credentials";
import { appendUpdates, committedUpdates, compactDocument, loadDocument } from "./persistence";
import { findSnapshot, insertSnapshot, latestSummary } from "./snapshots";
import type { CollabStore } from "./store";

/** `instance` signs the announcements of this process's appends, so it skips its own. */
export function postgresCollabStore(db: Db, instance: string): CollabStore {
  return {
    savedSource: async (mechanismId) => (await findMechanism(db, mechanismId))?.source ?? null,
    loadDocument: (mechanismId) => loadDocument(db, mechanismId),
    appendUpdates: (mechanismId, updates) => appendUpdates(db, mechanismId, updates, instance),
    committedUpdates: (mechanismId, first, last) => committedUpdates(db, mechanismId, first, last),
    compactDocument: (mechanismId, live) => compactDocument(db, mechanismId, live),
    saveSource: (mechanismId, source) => saveSource(db, mechanismId, source),
    latestSummary: (mechanismId) => latestSummary(db, mechanismId),
    insertSnapshot: (snapshot) => insertSnapshot(db, snapshot),
    roleOf: (mechanismId, userId) => roleOf(db, mechanismId, userId),
    findSnapshotSource: (mechanismId, snapshotId) => findSnapshot(db, mechanismId, snapshotId),
    endedCredentials: (members) => endedCredentials(db, members),
    async lastRoleChangeId() {
      const [row] = await db.select({ last: max(roleChanges.id) }).from(roleChanges);
      return row?.last ?? 0;
    },
    roleChangesAfter: (afterId, limit) =>
      db
        .select({ id: roleChanges.id, mechanismId: roleChanges.mechanismId, userId: roleChanges.subjectId, action: roleChanges.action })
        .from(roleChanges)
        .where(gt(roleChanges.id, afterId))
        .orderBy(asc(roleChanges.id))
        .limit(limit),
  };
}
