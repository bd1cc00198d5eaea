// Part of the build: bundles the server, the job worker, the CLI and the two worker-thread entries
// into plain JavaScript in build/ (packages stay in node_modules), so starting any of them — and
// every worker thread they start — costs no TypeScript transform. The bundles sit directly in
// build/, one level below the project root as their sources in server/ are, so paths the code
// finds from its own place (the project root, the bundle beside it) stay right.
import { build } from "esbuild";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");

export const bundles = {
  "mechweave-server": "server/main.ts",
  "mechweave-worker": "server/job-worker.ts",
  "mechweave-cli": "server/cli/main.ts",
  "job-thread": "server/sim/worker.ts",
  "analysis-thread": "server/collab/analysis-worker.ts",
};

await build({
  absWorkingDir: root,
  entryPoints: bundles,
  outdir: "build",
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  tsconfig: "tsconfig.json",
  sourcemap: "linked",
  logLevel: "warning",
});
