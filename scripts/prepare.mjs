// Set-up steps shared by `npm start` and `npm test`. Plain Node with no dependencies, because
// it runs before node_modules exists on a fresh machine.
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

export const projectRoot = path.resolve(import.meta.dirname, "..");

export function run(command, args, options = {}) {
  const result = spawnSync(command, args, { stdio: "inherit", cwd: projectRoot, ...options });
  if (result.status !== 0) {
    console.error(`\n${command} ${args.join(" ")} failed (exit ${result.status ?? result.signal}).`);
    process.exit(result.status || 1);
  }
}

/** Installs node_modules when missing or when package-lock.json changed since the last install. */
export function ensureDependencies() {
  const lock = readFileSync(path.join(projectRoot, "package-lock.json"));
  const digest = createHash("sha256").update(lock).digest("hex");
  const stamp = path.join(projectRoot, "node_modules", ".mechweave-installed");
  if (existsSync(stamp) && readFileSync(stamp, "utf8") === digest) return;
  console.log("Installing dependencies…");
  run("npm", ["ci", "--no-audit", "--no-fund"]);
  writeFileSync(stamp, digest);
}

const isRoot = process.getuid?.() === 0;
let aptUpdated = false;

/** Installs a Debian package when `probe` is missing (as root), or says exactly how to. */
export function ensureDebianPackage(name, probe) {
  if (existsSync(probe)) return;
  if (!isRoot) {
    console.error(`${probe} is missing. Run: sudo apt-get update && sudo apt-get install -y ${name}`);
    process.exit(1);
  }
  console.log(`Installing Debian's ${name} package…`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  if (!aptUpdated) run("apt-get", ["update"], { env });
  aptUpdated = true;
  run("apt-get", ["install", "-y", "--no-install-recommends", name], { env });
}

export function build() {
  run("npm", ["run", "-s", "build"]);
}
