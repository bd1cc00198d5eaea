// Boots Mechweave: database (embedded PostgreSQL unless DATABASE_URL), migrations, demo seed,
// services, and one http.Server for the app and the collaboration WebSocket.
import http from "node:http";
import path from "node:path";
import { createAuthenticator } from "./auth/authenticator";
import { RateLimiter } from "./auth/rate-limit";
import { createSessionStore } from "./auth/sessions";
import { signInLimits } from "./auth/sign-in-limits";
import { createApp } from "./app";
import { attachCollaboration } from "./collab/endpoint";
import { identifyCaller } from "./collab/identify";
import { applyMigrations, connect, ensureDatabase } from "./db/client";
import { hubTimings, jobSettings, publicOrigin, readEnv, signInSettings } from "./env";
import { instanceId } from "./instance";
import { startMailCatcher } from "./mail/catcher";
import { createMailer } from "./mail/mailer";
import { clusterDir, startEmbeddedPostgres, type EmbeddedPostgres } from "./postgres/embedded";
import { sessionSecrets } from "./secret";
import { JobConsumer } from "./sim/job-consumer";
import { JobQueue } from "./sim/job-queue";
import { QueuedJobs } from "./sim/queued-jobs";
import { WorkerJobs } from "./sim/run-in-worker";
import { DEMO_PASSWORD, demoAccounts, seedDemoIfEmpty } from "./seed/demo";
import { WorkerBudget } from "./worker-budget";

const projectRoot = path.resolve(import.meta.dirname, "..");
const env = readEnv();
const dev = process.argv.includes("--dev");

let embedded: EmbeddedPostgres | undefined;
let databaseUrl = env.DATABASE_URL;
if (!databaseUrl) {
  embedded = await startEmbeddedPostgres(clusterDir(projectRoot, "postgres"));
  databaseUrl = await ensureDatabase(embedded.adminUrl, "mechweave");
}
const database = connect(databaseUrl);
await applyMigrations(database.db, projectRoot);
if ((embedded || env.SEED_DEMO === "1") && (await seedDemoIfEmpty(database.db))) {
  console.log("Seeded the demo workspace.");
}

const mailCatcher = env.SMTP_URL ? null : await startMailCatcher();
const mailer = createMailer(env.SMTP_URL ?? mailCatcher!.url);

const server = http.createServer();
const origin = publicOrigin(env);
// Browsers send a Secure cookie only over https: set it whenever the public address is https.
const sessions = createSessionStore(database.db, sessionSecrets(projectRoot, env.SESSION_SECRET), origin?.startsWith("https:") ?? false);
// One budget of cores for every worker thread: the rooms' analyses and the API's jobs.
const workers = new WorkerBudget(env.WORKER_THREADS);
const jobs = new WorkerJobs(workers, jobSettings(env));
// Dynamics jobs go through the queue in the database, so any instance or worker may run them.
const queue = await JobQueue.open(databaseUrl);
const consumer = env.JOBS === "on" ? new JobConsumer(queue, jobs, { lanes: workers.jobsAtOnce, ranOn: instanceId }).start() : null;
const services = {
  db: database.db,
  sessions,
  authenticator: createAuthenticator(database.db),
  tokenLimiter: new RateLimiter(env.API_REQUESTS_PER_MINUTE, 60_000),
  signInLimits: signInLimits(database.db, signInSettings(env)),
  mailer,
  publicOrigin: origin,
  mailCatcher,
  dynamics: { run: new QueuedJobs(queue, jobs, jobSettings(env)).run },
  instance: instanceId,
  collab: await attachCollaboration(server, {
    db: database.db,
    databaseUrl,
    instance: instanceId,
    identify: identifyCaller(database.db, sessions),
    workers,
    timings: hubTimings(env),
    publicOrigin: origin,
    leave: dev ? (request) => /^vite-(hmr|ping)$/.test(request.headers["sec-websocket-protocol"] ?? "") : undefined,
  }),
};

const vite = dev
  ? await (await import("vite")).createServer({ root: projectRoot, server: { middlewareMode: true, hmr: { server } } })
  : undefined;
const app = await createApp({ projectRoot, services, vite, trustProxy: env.TRUST_PROXY });
server.on("request", app);

server.listen(env.PORT, env.HOST, () => {
  const address = server.address();
  const port = typeof address === "object" && address ? address.port : env.PORT;
  console.log(`Mechweave listening on http://${env.HOST}:${port}`);
  // Warm workers make the first simulation as quick as the rest; tests start many servers and skip it.
  if (env.NODE_ENV === "production") jobs.prewarm(env.JOB_HEAP_MB);
  if (embedded) {
    console.log(`Demo accounts (password ${DEMO_PASSWORD}): ${demoAccounts.map((a) => a.email).join(", ")}`);
  }
});

let stopping = false;
async function shutdown() {
  if (stopping) return;
  stopping = true;
  // Rooms flush their updates, text and last analysis before the database goes away; a database
  // that is already gone must not hold the shutdown (clients keep unsent edits and resend them).
  await Promise.race([services.collab.close(), new Promise((resolve) => setTimeout(resolve, 10_000))]);
  server.closeAllConnections();
  await new Promise((resolve) => server.close(resolve));
  await consumer?.stop();
  await queue.close();
  await vite?.close();
  await database.close();
  await mailCatcher?.close();
  embedded?.stop();
  process.exit(0);
}
process.on("SIGINT", shutdown);
process.on("SIGTERM", shutdown);
