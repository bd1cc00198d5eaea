// Access changes reach live connections from the audit trail: every grant, change, revoke,
// transfer, delete and view-link revocation writes a role_changes row in the same transaction, so
// reading new rows every second applies a change even when the route that made it did not call
// refreshRole.
import type { roleChanges } from "../db/schema";
import type { CollabStore } from "./store";

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
  private again = false;

  constructor(
    private readonly store: Pick<CollabStore, "lastRoleChangeId" | "roleChangesAfter">,
    private readonly changed: (change: RoleChange) => Promise<void>,
  ) {}

  start(intervalMs: number) {
    void this.poll();
    this.timer = setInterval(() => void this.poll(), intervalMs);
    this.timer.unref();
  }

  /** Reads new rows now (another instance wrote one); a read under way is followed by one more. */
  readNow() {
    void this.poll();
  }

  stop() {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  private async poll() {
    if (this.reading) {
      this.again = true;
      return;
    }
    this.reading = true;
    this.again = false;
    try {
      if (this.lastSeen === null) {
        this.lastSeen = await this.store.lastRoleChangeId();
        return;
      }
      for (const { id, ...change } of await this.store.roleChangesAfter(this.lastSeen, 1000)) {
        this.lastSeen = id;
        await this.changed(change);
      }
    } catch (error) {
      console.error(`[collab] reading role changes failed: ${(error as Error).message}`);
    } finally {
      this.reading = false;
      if (this.again) void this.poll();
    }
  }
}
