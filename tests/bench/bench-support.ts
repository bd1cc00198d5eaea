// What the collaboration benchmarks share: a PostgreSQL cluster of their own with the migrated
// template the test servers clone, and one line of latency figures.
import { rmSync } from "node:fs";
import path from "node:path";
import { applyMigrations, connect, ensureDatabase } from "../../server/db/client";
import { clusterDir, startEmbeddedPostgres } from "../../server/postgres/embedded";
import { TEMPLATE_DATABASE } from "../support/database";

const projectRoot = path.resolve(import.meta.dirname, "../..");

/** Runs `task` with a fresh cluster on `port` (test servers find it through MW_TEST_ADMIN_URL), then removes it. */
export async function withBenchCluster(name: string, port: number, task: () => Promise<void>) {
  const baseDir = clusterDir(projectRoot, `postgres-${name}-${process.pid}`);
  const postgres = await startEmbeddedPostgres(baseDir, port);
  // An interrupted run still stops its cluster (the servers and the clients die with this process).
  for (const signal of ["SIGINT", "SIGTERM"] as const) {
    process.once(signal, () => {
      postgres.stop();
      rmSync(baseDir, { recursive: true, force: true });
      process.exit(1);
    });
  }
  try {
    const template = connect(await ensureDatabase(postgres.adminUrl, TEMPLATE_DATABASE));
    await applyMigrations(template.db, projectRoot);
    await template.close();
    process.env.MW_TEST_ADMIN_URL = postgres.adminUrl;
    await task();
  } finally {
    postgres.stop();
    rmSync(baseDir, { recursive: true, force: true });
  }
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

/** Prints p50 and p95 of `samples` (ms) against a p95 target. */
export function summary(label: string, samples: number[], target: number) {
  const sorted = [...samples].sort((a, b) => a - b);
  const [p50, p95] = [percentile(sorted, 50), percentile(sorted, 95)];
  const verdict = p95 < target ? "meets" : "MISSES";
  console.log(`  ${label.padEnd(56)} n=${String(sorted.length).padStart(6)}  p50 ${p50.toFixed(1).padStart(6)} ms  p95 ${p95.toFixed(1).padStart(6)} ms  (${verdict} p95 < ${target} ms)`);
}
