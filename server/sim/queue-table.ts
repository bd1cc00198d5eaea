// What the queue's callers and consumers read and write in pg-boss's own job table, where pg-boss
// has no call for it: the per-user limits hold across every instance because they are counted
// there. A job's owner (a user, or a guest's address) is its `singleton_key` (indexed, and unused
// by a `standard` queue otherwise); how many of the owner's jobs may run at once is in its data,
// as the instance that took the request counts, so workers need no setting of their own.
import type pg from "pg";
import type PgBoss from "pg-boss";
import { QueueFullError } from "./admission";
import type { QueuedJob, QueuedJobData } from "./job-queue";

/** pg-boss's default schema, which `JobQueue.open` keeps. */
const SCHEMA = "pgboss";
/** Seconds a refused caller is told to wait. */
const RETRY_AFTER_S = 10;

export interface OwnerLimits {
  /** Jobs one owner may run at once. */
  running: number;
  /** Jobs one owner may have waiting; one more is refused. */
  queued: number;
}

export interface Submission {
  queue: string;
  id: string;
  owner: string;
  job: QueuedJob;
  expireInSeconds: number;
}

/**
 * Stores the job unless its owner already has `running + queued` jobs in the queue. The count and
 * the insert share a transaction holding the owner's advisory lock, so two instances submitting
 * for one owner at once are counted one after the other.
 */
export async function submitWithinLimits(sql: pg.Pool, boss: PgBoss, limits: OwnerLimits, job: Submission): Promise<void> {
  await inTransaction(sql, async (client) => {
    await client.query("select pg_advisory_xact_lock(hashtextextended($1, 0))", [`mechweave-job-owner:${job.owner}`]);
    const { rows } = await client.query<{ jobs: number }>(
      `select count(*)::int as jobs from ${SCHEMA}.job where name = $1 and singleton_key = $2 and state <= 'active'`,
      [job.queue, job.owner],
    );
    if (rows[0].jobs >= limits.running + limits.queued) {
      const jobs = limits.queued === 1 ? "job" : "jobs";
      throw new QueueFullError(`you already have ${limits.queued} ${jobs} waiting besides the one running; wait for them to finish or cancel one`, RETRY_AFTER_S);
    }
    await boss.send(job.queue, { job: job.job, runningPerOwner: limits.running } satisfies QueuedJobData, {
      id: job.id,
      singletonKey: job.owner,
      retryLimit: 0,
      expireInSeconds: job.expireInSeconds,
      db: { executeSql: (text: string, values: unknown[]) => client.query(text, values) },
    });
  });
}

/**
 * Starts the oldest waiting job whose owner runs fewer jobs than it allows, skipping owners at their
 * cap (pg-boss's own fetch has no such test). Takes are one at a time over every consumer (an
 * advisory lock for the length of a short transaction), so two consumers never both see an owner
 * one job short of the cap. Null when no job may start.
 */
export async function takeNext(sql: pg.Pool, queue: string): Promise<{ id: string; data: unknown } | null> {
  return inTransaction(sql, async (client) => {
    await client.query("select pg_advisory_xact_lock(hashtextextended($1, 0))", [`mechweave-job-take:${queue}`]);
    const { rows } = await client.query<{ id: string; data: unknown }>(
      `with next as (
         select id from ${SCHEMA}.job j
         where name = $1 and state < 'active' and start_after < now()
           and (select count(*) from ${SCHEMA}.job a where a.name = $1 and a.state = 'active' and a.singleton_key = j.singleton_key)
             < coalesce((j.data->>'runningPerOwner')::int, 1)
         order by priority desc, created_on, id
         limit 1
         for update skip locked
       )
       update ${SCHEMA}.job j set state = 'active', started_on = now()
       from next where j.name = $1 and j.id = next.id
       returning j.id, j.data`,
      [queue],
    );
    return rows[0] ?? null;
  });
}

/** Runs `work` in a transaction on one pooled connection: committed if it returns, rolled back if it throws. */
async function inTransaction<T>(sql: pg.Pool, work: (client: pg.PoolClient) => Promise<T>): Promise<T> {
  const client = await sql.connect();
  try {
    await client.query("begin");
    const result = await work(client);
    await client.query("commit");
    return result;
  } catch (error) {
    await client.query("rollback").catch(() => undefined);
    throw error;
  } finally {
    client.release();
  }
}

export interface StoredJob {
  state: "created" | "retry" | "active" | "completed" | "cancelled" | "failed";
  output: unknown;
  /** While it waits: its 1-based place among the queue's waiting jobs (first come, first served). */
  place: number | null;
}

/** The job's state and output, and its place in line while it waits; null once its row is gone. */
export async function readJob(sql: pg.Pool, queue: string, id: string): Promise<StoredJob | null> {
  const { rows } = await sql.query<StoredJob>(
    `select j.state, j.output,
       case when j.state < 'active' then (
         select count(*)::int + 1 from ${SCHEMA}.job o
         where o.name = $1 and o.state < 'active' and (o.created_on, o.id) < (j.created_on, j.id)
       ) end as place
     from ${SCHEMA}.job j where j.name = $1 and j.id = $2`,
    [queue, id],
  );
  return rows[0] ?? null;
}
