// Environment, parsed once at boot; the one module that reads process.env. Every other module
// takes its settings as options from server/main.ts. Nothing here reaches the browser. An unset
// key leaves the module's own default (the table in DEVELOPERS.md lists them).
import { z } from "zod";
import type { SignInLimitSettings } from "./auth/sign-in-limits";
import type { HubTimings } from "./collab/hub";
import type { JobRunnerOptions } from "./sim/run-in-worker";

/** A whole number of at least `min` (a count, milliseconds, megabytes). */
const integer = (min: number) => z.coerce.number().int().min(min);

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  PORT: integer(0).max(65535).default(3000),
  HOST: z.string().default("127.0.0.1"),
  DATABASE_URL: z.string().url().optional(),
  SMTP_URL: z.string().url().optional(),
  /**
   * Where people reach Mechweave: the origin of every mailed or shared link, an origin allowed to
   * write besides the request's own host, and https makes cookies Secure.
   */
  PUBLIC_URL: z.url({ protocol: /^https?$/, message: "PUBLIC_URL must be an http or https URL." }).optional(),
  /**
   * Which proxies may speak for the client in X-Forwarded-For (Express's "trust proxy"): unset or
   * "false" believes nobody, a number that many hops, else addresses, subnets or "loopback".
   */
  TRUST_PROXY: z
    .string()
    .optional()
    .transform((value): boolean | number | string => {
      if (value === undefined || value === "" || value === "false") return false;
      if (value === "true") return true;
      return /^\d+$/.test(value) ? Number(value) : value;
    }),
  /**
   * Cookie signing secrets, comma-separated: the first signs, every one verifies, so a new secret
   * goes first and the old one stays behind it until the sessions it signed have expired.
   */
  SESSION_SECRET: z
    .string()
    .optional()
    .transform((value) => (value ? value.split(",").map((secret) => secret.trim()) : undefined))
    .pipe(z.array(z.string().min(16, "each SESSION_SECRET must be at least 16 characters")).optional()),
  /** Seed the demo workspace even into an external database. */
  SEED_DEMO: z.enum(["0", "1"]).optional(),
  /** Time limit for analysing one text (HTTP and live rooms alike), in milliseconds. */
  ANALYSIS_TIME_LIMIT_MS: integer(100).default(20_000),

  // Worker threads and jobs (server/sim/run-in-worker.ts, server/collab/analysis-pool.ts).
  /** "off": this app instance only puts jobs in the queue, and `npm run worker` processes run them. */
  JOBS: z.enum(["on", "off"]).default("on"),
  /** Worker threads each pool (jobs, room analyses) may use at once. */
  WORKER_THREADS: integer(1).optional(),
  /** Wall-clock limit per simulation or realization job, queueing excluded. */
  JOB_TIME_LIMIT_MS: integer(100).optional(),
  /** Heap limit per job's worker thread, in MB. */
  JOB_HEAP_MB: integer(16).optional(),
  /** Jobs of one kind one user may run at once. */
  JOBS_RUNNING_PER_USER: integer(1).optional(),
  /** Jobs of one kind one user may have waiting; one more is refused with 429. */
  JOBS_QUEUED_PER_USER: integer(0).optional(),

  // Requests and sign-ins (server/auth/).
  /** Requests per API token per minute. */
  API_REQUESTS_PER_MINUTE: integer(1).default(120),
  /** Failed sign-ins per account and address before each further one doubles the wait. */
  SIGN_IN_FREE_FAILURES: integer(1).optional(),
  /** Failed sign-ins per address (any account) before that address waits out the window. */
  SIGN_IN_FAILURES_PER_ADDRESS: integer(1).optional(),
  /** How long a failed sign-in counts, in milliseconds. */
  SIGN_IN_WINDOW_MS: integer(1000).optional(),

  // Live rooms (server/collab/hub.ts, room.ts).
  /** Shortest interval between two analyses of a room's changing text. */
  COLLAB_RECOMPUTE_MS: integer(0).optional(),
  /** Quiet time after a change of structure before it is recorded as an automatic version. */
  COLLAB_SNAPSHOT_QUIET_MS: integer(0).optional(),
  /** Shortest interval between two writes of a room's changing text to its mechanism row. */
  COLLAB_SOURCE_MIRROR_MS: integer(0).optional(),
  /** Stored document updates between two compactions of a room's history. */
  COLLAB_COMPACT_EVERY: integer(1).optional(),
  /** A room without connections is unloaded when idle this long. */
  COLLAB_IDLE_UNLOAD_MS: integer(0).optional(),
  /** How often role changes are read from the audit trail (and sessions' ends followed). */
  COLLAB_ROLE_FEED_MS: integer(10).optional(),
  /** How often every connection's role is re-read, as a safety net. */
  COLLAB_ROLE_SWEEP_MS: integer(10).optional(),
  /** Sockets that miss a ping for this long are dropped. */
  COLLAB_HEARTBEAT_MS: integer(10).optional(),
  /** How often an instance following a room tries to lead it (its leader may have died). */
  COLLAB_LEADER_RETRY_MS: integer(10).optional(),
});

export type Env = z.infer<typeof schema>;

/** Every key Mechweave reads (DEVELOPERS.md documents each). */
export const environmentKeys = Object.keys(schema.shape);

/** The environment's settings, or an error that names every bad key. */
export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = schema.safeParse(source);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`bad environment: ${problems}`);
  }
  return parsed.data;
}

/** PUBLIC_URL's origin (scheme, host, port), or null when unset. */
export function publicOrigin(env: Env): string | null {
  return env.PUBLIC_URL ? new URL(env.PUBLIC_URL).origin : null;
}

/**
 * The settings that are set. Modules spread options over their defaults, where a key present but
 * undefined would hide the default.
 */
function given<T extends object>(settings: T): Partial<T> {
  return Object.fromEntries(Object.entries(settings).filter(([, value]) => value !== undefined)) as Partial<T>;
}

export function jobSettings(env: Env): JobRunnerOptions {
  return {
    limits: given({ timeMs: env.JOB_TIME_LIMIT_MS, analysisTimeMs: env.ANALYSIS_TIME_LIMIT_MS, heapMb: env.JOB_HEAP_MB }),
    runningPerUser: env.JOBS_RUNNING_PER_USER,
    queuedPerUser: env.JOBS_QUEUED_PER_USER,
  };
}

export function signInSettings(env: Env): Partial<SignInLimitSettings> {
  return given({ windowMs: env.SIGN_IN_WINDOW_MS, freeFailures: env.SIGN_IN_FREE_FAILURES, failuresPerAddress: env.SIGN_IN_FAILURES_PER_ADDRESS });
}

export function hubTimings(env: Env): Partial<HubTimings> {
  return given({
    recomputeMs: env.COLLAB_RECOMPUTE_MS,
    snapshotQuietMs: env.COLLAB_SNAPSHOT_QUIET_MS,
    sourceMirrorMs: env.COLLAB_SOURCE_MIRROR_MS,
    compactEvery: env.COLLAB_COMPACT_EVERY,
    idleUnloadMs: env.COLLAB_IDLE_UNLOAD_MS,
    roleFeedMs: env.COLLAB_ROLE_FEED_MS,
    roleSweepMs: env.COLLAB_ROLE_SWEEP_MS,
    heartbeatMs: env.COLLAB_HEARTBEAT_MS,
    leaderRetryMs: env.COLLAB_LEADER_RETRY_MS,
    analysisTimeoutMs: env.ANALYSIS_TIME_LIMIT_MS,
  });
}
