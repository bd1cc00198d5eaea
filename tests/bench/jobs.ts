// Job throughput: small simulations (one step, ten samples) run in this process's worker threads
// directly, through the queue with this process consuming, and through the queue with a separate
// `npm run worker` process consuming (its bundle, when built). Jobs per second at 1 and at 16
// callers at once; each job belongs to a caller of its own, so the per-user caps stay out of it.
// Own PostgreSQL cluster and database. Run after a build (npm run build): npx tsx tests/bench/jobs.ts
import { spawn } from "node:child_process";
import { once } from "node:events";
import { existsSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { ensureDatabase } from "../../server/db/client";
import { clusterDir, startEmbeddedPostgres } from "../../server/postgres/embedded";
import { JobConsumer } from "../../server/sim/job-consumer";
import { JobQueue } from "../../server/sim/job-queue";
import type { DynamicsJob } from "../../server/sim/job";
import { QueuedJobs } from "../../server/sim/queued-jobs";
import { WorkerJobs, type RunJob } from "../../server/sim/run-in-worker";
import { WorkerBudget } from "../../server/worker-budget";
import { simulateSettings } from "../../app/shared/job-schemas";

const projectRoot = path.resolve(import.meta.dirname, "../..");
const workerBundle = path.join(projectRoot, "build", "mechweave-worker.js");
const JOBS = 64;
const job: DynamicsJob = {
  kind: "simulate",
  model: { kind: "text", source: "A -> B @ 1\n[A]0 = 1\n" },
  settings: simulateSettings.parse({ until: 1, samples: 10 }),
};

/** Jobs per second for JOBS jobs, `callers` of them in flight at a time. */
async function throughput(run: RunJob, callers: number): Promise<number> {
  let next = 0;
  const started = performance.now();
  await Promise.all(
    Array.from({ length: callers }, async () => {
      while (next < JOBS) await run(job, { owner: `bench:${next++}` });
    }),
  );
  return JOBS / ((performance.now() - started) / 1000);
}

async function report(label: string, run: RunJob) {
  await throughput(run, 4); // boots the worker threads
  const [one, many] = [await throughput(run, 1), await throughput(run, 16)];
  console.log(`| ${label} | ${one.toFixed(1)} | ${many.toFixed(1)} |`);
}

/** A `npm run worker` process on the database, ready to take jobs. */
async function startWorkerProcess(databaseUrl: string, threads: number) {
  const child = spawn(process.execPath, [workerBundle], { env: { ...process.env, DATABASE_URL: databaseUrl, WORKER_THREADS: String(threads), NODE_ENV: "production" }, stdio: ["ignore", "pipe", "inherit"] });
  await new Promise<void>((resolve, reject) => {
    child.stdout!.on("data", (chunk: Buffer) => chunk.toString().includes("worker ready:") && resolve());
    child.once("exit", (code) => reject(new Error(`the worker exited (${code})`)));
  });
  return child;
}

async function main() {
  const baseDir = clusterDir(projectRoot, `postgres-bench-${process.pid}`);
  const postgres = await startEmbeddedPostgres(baseDir, 55481);
  try {
    const databaseUrl = await ensureDatabase(postgres.adminUrl, "mechweave_bench_jobs");
    const budget = new WorkerBudget();
    console.log(`${JOBS} jobs, ${budget.jobsAtOnce} at once per process, ${os.availableParallelism()} cores, load ${os.loadavg()[0].toFixed(1)}\n`);
    console.log("| path | jobs/s, 1 caller | jobs/s, 16 callers |\n| --- | --- | --- |");

    const local = new WorkerJobs(budget);
    await report("in process (worker threads)", local.run);

    const queue = await JobQueue.open(databaseUrl);
    const consumer = new JobConsumer(queue, local, { lanes: budget.jobsAtOnce, ranOn: "bench" }).start();
    const queued = new QueuedJobs(queue, local);
    await report("queue, consumed by the same process", queued.run);
    await consumer.stop();

    if (existsSync(workerBundle)) {
      const worker = await startWorkerProcess(databaseUrl, budget.cores);
      await report("queue, consumed by a worker process", queued.run);
      worker.kill("SIGTERM");
      await once(worker, "exit");
    } else console.log("(no build/mechweave-worker.js: run npm run build for the worker-process row)");
    await queue.close();
  } finally {
    postgres.stop();
    rmSync(baseDir, { recursive: true, force: true });
  }
}

await main();
process.exit(0);
