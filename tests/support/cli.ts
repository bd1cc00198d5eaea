// The real command line, as `npx tsx server/cli/main.ts …` runs it (node with the tsx loader).
import { spawnSync } from "node:child_process";

export function mechweave(...args: string[]) {
  const run = spawnSync(process.execPath, ["--import", "tsx", "server/cli/main.ts", ...args], { encoding: "utf8", timeout: 60_000 });
  return { code: run.status, stdout: run.stdout, stderr: run.stderr };
}
