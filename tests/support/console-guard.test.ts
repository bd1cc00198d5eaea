// The console guard judged by vitest itself: a fixture file whose tests are named for the verdict
// the guard must give them, run in a vitest of its own.
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { expect, it } from "vitest";

const projectRoot = path.resolve(import.meta.dirname, "../..");

interface JsonReport {
  testResults: { assertionResults: { title: string; status: string }[] }[];
}

it("fails exactly the tests that print an unannounced error or miss an announced one", async () => {
  const vitest = path.join(projectRoot, "node_modules/vitest/vitest.mjs");
  const config = path.join(projectRoot, "tests/fixtures/console-guard/vitest.config.ts");
  const run = await promisify(execFile)(process.execPath, [vitest, "run", "--config", config, "--reporter=json"], { cwd: projectRoot }).catch(
    // Failing tests make vitest exit 1; the report is on stdout all the same.
    (error: { stdout: string }) => error,
  );
  const report = JSON.parse(run.stdout) as JsonReport;
  const results = report.testResults.flatMap((file) => file.assertionResults);
  expect(results.length).toBe(7);
  for (const { title, status } of results) expect({ title, status }).toEqual({ title, status: title.startsWith("passes") ? "passed" : "failed" });
});
