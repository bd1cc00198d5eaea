// `npm run worker`: a process that only runs dynamics jobs from the queue, on any machine that
// reaches the database. It prints `worker ready: ID` once it takes jobs; SIGTERM stops it (jobs
// still running fail with a message asking for a new run).
import { instanceId } from "./instance";
import { jobSettings, readEnv } from "./env";
import { JobConsumer } from "./sim/job-consumer";
import { JobQueue } from "./sim/job-queue";
import { WorkerJobs } from "./sim/run-in-worker";
import { WorkerBudget } from "./worker-budget";

const env = readEnv();
if (!env.DATABASE_URL) {
  console.error("A worker needs DATABASE_URL: the PostgreSQL database its app instances use.");
  process.exit(1);
}
const workers = new WorkerBudget(env.WORKER_THREADS);
const jobs = new WorkerJobs(workers, jobSettings(env));
const queue = await JobQueue.open(env.DATABASE_URL);
const consumer = new JobConsumer(queue, jobs, { lanes: workers.jobsAtOnce, ranOn: instanceId }).start();
if (env.NODE_ENV === "production") jobs.prewarm(env.JOB_HEAP_MB);
console.log(`worker ready: ${instanceId}`);

let stopping = false;
async function shutdown() {
  if (stopping) return;
  stopping = true;
  await consumer.stop();
  await queue.close();
  process.exit(0);
}
process.on("SIGINT", shutdown);
process.on("SIGTERM", shutdown);
