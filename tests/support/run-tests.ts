// Starts the test cluster (apart from the one `npm start` uses), prepares a migrated template
// database that each test file clones, runs vitest, and stops the cluster whatever happens.
import { spawn } from "node:child_process";
import path from "node:path";
import { applyMigrations, connect, ensureDatabase } from "../../server/db/client";
import { clusterDir, startEmbeddedPostgres } from "../../server/postgres/embedded";
import { TEMPLATE_DATABASE } from "./database";

const projectRoot = path.resolve(import.meta.dirname, "../..");
const postgres = await startEmbeddedPostgres(clusterDir(projectRoot, "postgres-test"), 55432);
let exitCode = 1;
try {
  const admin = new URL(postgres.adminUrl);
  const client = new (await import("pg")).default.Client(postgres.adminUrl);
  await client.connect();
  // Leftovers of an interrupted run would make the template stale; start from scratch.
  const stale = await client.query("select datname from pg_database where datname like 'mwt_%' or datname = $1", [TEMPLATE_DATABASE]);
  for (const { datname } of stale.rows) await client.query(`drop database if exists "${datname}" with (force)`);
  await client.end();
  const templateUrl = await ensureDatabase(postgres.adminUrl, TEMPLATE_DATABASE);
  const template = connect(templateUrl);
  await applyMigrations(template.db, projectRoot);
  await template.close();

  exitCode = await new Promise<number>((resolve) => {
    const vitest = spawn(process.execPath, [path.join(projectRoot, "node_modules/vitest/vitest.mjs"), "run", ...process.argv.slice(2)], {
      cwd: projectRoot,
      stdio: "inherit",
      env: { ...process.env, MW_TEST_ADMIN_URL: admin.toString() },
    });
    vitest.on("exit", (code) => resolve(code ?? 1));
  });
} finally {
  postgres.stop();
}
process.exit(exitCode);
