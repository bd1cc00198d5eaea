// Access changes reach live connections from the audit trail: every grant, change, revoke,
// transfer, delete and view-link revocation writes a role_changes row in the same transaction, so
// reading new rows every second applies a change even when the route that made it did not call
// refreshRole.
import { asc, gt, max } from "drizzle-orm";
import type { Db } from "../db/client";
import { roleChanges } from "../db/schema";

export interface RoleChange {
  mechanismId: string;
  /** Whose role changed; null for a view link or an account that is gone. */
  userId: string | null;
  action: (typeof roleChanges.$inferSelect)["action"];
}

export class RoleChangeFeed {
  private lastSeen: number | null = null;
  private timer: NodeJS.Timeout | null = null;
  private reading = false;

  constructor(
    private readonly db: Db,
    private readonly changed: (change: RoleChange) => Promise<void>,
  ) {}

  start(intervalMs: number) {
    void this.poll();
    this.timer = setInterval(() => void this.poll(), intervalMs);
    this.timer.unref();
  }

  stop() {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  private async poll() {
    if (this.reading) return;
    this.reading = true;
    try {
      if (this.lastSeen === null) {
        const [row] = await this.db.select({ last: max(roleChanges.id) }).from(roleChanges);
        this.lastSeen = row?.last ?? 0;
        return;
      }
      const rows = await this.db
        .select({ id: roleChanges.id, mechanismId: roleChanges.mechanismId, userId: roleChanges.subjectId, action: roleChanges.action })
        .from(roleChanges)
        .where(gt(roleChanges.id, this.lastSeen))
        .orderBy(asc(roleChanges.id))
        .limit(1000);
      for (const row of rows) {
        this.lastSeen = row.id;
        await this.changed(row);
      }
    } catch (error) {
      console.error(`[collab] reading role changes failed: ${(error as Error).message}`);
    } finally {
      this.reading = false;
    }
  }
}
