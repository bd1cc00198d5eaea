// The real command line, as `npm run mechweave` runs it: from its prebuilt bundle when the build is
// fresh (as under `npm test`), else from the source under tsx (scripts/cli.mjs decides). A call
// under tsx pays seconds of TypeScript transform, many on a busy machine, which made CLI tests time
// out; the bundle starts in a fraction of that. Asynchronous, so vitest's own timeout can still act.
import { execFile } from "node:child_process";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "../..");

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

export function mechweave(...args: string[]): Promise<CliRun> {
  return new Promise((resolve) => {
    execFile(process.execPath, [path.join(root, "scripts/cli.mjs"), ...args], { cwd: root, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? (typeof error.code === "number" ? error.code : 1) : 0;
      resolve({ code, stdout, stderr });
    });
  });
}
