// The job queue every process of one deployment shares: pg-boss tables in the application's own
// PostgreSQL (schema `pgboss`) hold each dynamics job, its state and its result; `JobEvents`
// carries the moments in between. App instances submit (`queued-jobs.ts`); app instances that run
// jobs and `npm run worker` processes consume (`job-consumer.ts`); the per-user limits are counted
// in pg-boss's table (`queue-table.ts`). See decision 0XX.
import pg from "pg";
import PgBoss from "pg-boss";
import type { DynamicsJob, RealizationJob } from "./job";
import { JobEvents } from "./job-events";

/** One queue for every kind of dynamics job: a worker takes whichever comes first. */
export const DYNAMICS_QUEUE = "mechweave-dynamics";

/** A job as it waits in the queue: JSON, so its model is text (the API sends nothing else). */
export type QueuedJob = DynamicsJob | RealizationJob;

export interface QueuedJobData {
  job: QueuedJob;
  /** How many of its owner's jobs may run at once, as the instance that stored it counts (`queue-table.ts`). */
  runningPerOwner: number;
}

export class JobQueue {
  private constructor(
    readonly boss: PgBoss,
    readonly events: JobEvents,
    /** For what pg-boss has no call for: the owners' counts, taking a job, a waiting job's place. */
    readonly sql: pg.Pool,
  ) {}

  /** Opens the queue, creating its tables on a new database (pg-boss migrates under an advisory lock, so instances may start together). */
  static async open(databaseUrl: string): Promise<JobQueue> {
    const boss = new PgBoss({
      connectionString: databaseUrl,
      max: 4,
      // No cron here; the supervisor fails jobs whose process died once they pass their expiry.
      schedule: false,
      // A finished job's row is deleted by the caller that reads its result; one nobody read is
      // archived after an hour and deleted a day later.
      archiveCompletedAfterSeconds: 3_600,
      deleteAfterSeconds: 86_400,
    });
    boss.on("error", (error) => console.error(`[jobs] ${error.message}`));
    await boss.start();
    await boss.createQueue(DYNAMICS_QUEUE, { name: DYNAMICS_QUEUE, policy: "standard", retryLimit: 0 });
    const events = new JobEvents(databaseUrl);
    await events.listen();
    const sql = new pg.Pool({ connectionString: databaseUrl, max: 4 });
    sql.on("error", () => undefined);
    return new JobQueue(boss, events, sql);
  }

  async close(): Promise<void> {
    await this.events.close();
    await this.boss.stop({ graceful: false, wait: true, close: true });
    await this.sql.end();
  }
}
