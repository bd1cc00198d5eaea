// `npm run mechweave -- …`: the command line from its prebuilt bundle (build/mechweave-cli.js, made
// by the build), which starts without a TypeScript transform; from the source under tsx when there
// is no bundle yet or a source file changed after it was built.
import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const bundle = path.join(root, "build", "mechweave-cli.js");

function newestSource(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource(full));
    else if (/\.(ts|js|grammar)$/.test(entry.name)) newest = Math.max(newest, statSync(full).mtimeMs);
  }
  return newest;
}

const fresh = existsSync(bundle) && statSync(bundle).mtimeMs >= Math.max(...["app/chem", "app/shared", "server", "grammar"].map((dir) => newestSource(path.join(root, dir))));
const args = process.argv.slice(2);
const command = fresh
  ? [bundle, ...args]
  : (spawnSync(process.execPath, [path.join(root, "scripts/ensure-generated.mjs")], { stdio: "inherit" }), ["--import", "tsx", path.join(root, "server/cli/main.ts"), ...args]);
const result = spawnSync(process.execPath, command, { stdio: "inherit" });
process.exit(result.status ?? 1);
