// Starts a test cluster of its own (apart from the one `npm start` uses, and from any other test
// run on the machine), prepares a migrated template database that each test file clones, runs
// vitest, and stops and removes the cluster whatever happens.
import { spawn } from "node:child_process";
import { rmSync } from "node:fs";
import path from "node:path";
import { applyMigrations, connect, ensureDatabase } from "../../server/db/client";
import { clusterDir, startEmbeddedPostgres } from "../../server/postgres/embedded";
import { JobQueue } from "../../server/sim/job-queue";
import { TEMPLATE_DATABASE } from "./database";

const projectRoot = path.resolve(import.meta.dirname, "../..");
const baseDir = clusterDir(projectRoot, `postgres-test-${process.pid}`);
const postgres = await startEmbeddedPostgres(baseDir, 55432);
let exitCode = 1;
try {
  const templateUrl = await ensureDatabase(postgres.adminUrl, TEMPLATE_DATABASE);
  const template = connect(templateUrl);
  await applyMigrations(template.db, projectRoot);
  await template.close();
  // The job queue's tables too, so the many test servers do not each create them.
  await (await JobQueue.open(templateUrl)).close();

  exitCode = await new Promise<number>((resolve) => {
    const vitest = spawn(process.execPath, [path.join(projectRoot, "node_modules/vitest/vitest.mjs"), "run", ...process.argv.slice(2)], {
      cwd: projectRoot,
      stdio: "inherit",
      env: { ...process.env, MW_TEST_ADMIN_URL: postgres.adminUrl },
    });
    vitest.on("exit", (code) => resolve(code ?? 1));
  });
} finally {
  postgres.stop();
  rmSync(baseDir, { recursive: true, force: true });
}
process.exit(exitCode);
