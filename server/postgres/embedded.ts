// An embedded PostgreSQL cluster from Debian's packages, used when DATABASE_URL is not set.
// initdb and postgres refuse to run as root, so as root they run as the `postgres` system user,
// and the cluster lives where that user can reach it.
import { execFileSync, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { accessSync, chownSync, constants, existsSync, mkdirSync, readdirSync, readFileSync, statSync } from "node:fs";
import net from "node:net";
import path from "node:path";

const isRoot = process.getuid?.() === 0;

export interface EmbeddedPostgres {
  /** Connection URL of the `postgres` maintenance database. */
  adminUrl: string;
  port: number;
  stop(): void;
}

function serverBinDir(): string | null {
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return null;
  const majors = readdirSync(root)
    .filter((name) => existsSync(path.join(root, name, "bin", "initdb")))
    .sort((a, b) => Number(b) - Number(a));
  return majors.length ? path.join(root, majors[0], "bin") : null;
}

/** Installs Debian's postgresql package when missing (as root), or says how to. */
export function ensurePostgresInstalled(): string {
  const found = serverBinDir();
  if (found) return found;
  if (!isRoot) {
    throw new Error("PostgreSQL is not installed. Run: sudo apt-get update && sudo apt-get install -y postgresql");
  }
  console.log("[postgres] installing Debian's postgresql package…");
  execFileSync("apt-get", ["update"], { stdio: "inherit" });
  execFileSync("apt-get", ["install", "-y", "postgresql"], { stdio: "inherit", env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
  const installed = serverBinDir();
  if (!installed) throw new Error("apt-get installed postgresql but no server binaries were found under /usr/lib/postgresql");
  return installed;
}

/** True when the `postgres` user can walk down to `dir` (every ancestor executable by others). */
function reachableByPostgresUser(dir: string): boolean {
  for (let current = path.resolve(dir); ; current = path.dirname(current)) {
    if (existsSync(current) && (statSync(current).mode & 0o001) === 0) return false;
    if (current === path.dirname(current)) return true;
  }
}

/** `.data/NAME` in the checkout, or a folder under /var/tmp named after the checkout if closed. */
export function clusterDir(projectRoot: string, name: string): string {
  const inCheckout = path.join(projectRoot, ".data", name);
  if (!isRoot || reachableByPostgresUser(path.join(projectRoot, ".data"))) return inCheckout;
  const tag = createHash("sha1").update(path.resolve(projectRoot)).digest("hex").slice(0, 10);
  return path.join("/var/tmp", `mechweave-${tag}`, name);
}

function runAsOwner(bin: string, args: string[]) {
  const [command, argv] = isRoot ? ["runuser", ["-u", "postgres", "--", bin, ...args]] : [bin, args];
  const result = spawnSync(command, argv, { encoding: "utf8" });
  if (result.status !== 0) throw new Error(`${path.basename(bin)} failed: ${result.stderr || result.stdout}`);
  return result.stdout;
}

function makeOwnedDir(dir: string) {
  mkdirSync(dir, { recursive: true, mode: 0o755 });
  if (isRoot) {
    const { uid, gid } = postgresUser();
    chownSync(dir, uid, gid);
  }
}

function postgresUser() {
  const line = readFileSync("/etc/passwd", "utf8").split("\n").find((l) => l.startsWith("postgres:"));
  if (!line) throw new Error("the postgres system user is missing; reinstall Debian's postgresql package");
  const [, , uid, gid] = line.split(":");
  return { uid: Number(uid), gid: Number(gid) };
}

async function freePort(preferred: number): Promise<number> {
  for (let port = preferred; port < preferred + 200; port++) {
    const ok = await new Promise<boolean>((resolve) => {
      const probe = net.createServer().once("error", () => resolve(false));
      probe.listen(port, "127.0.0.1", () => probe.close(() => resolve(true)));
    });
    if (ok) return port;
  }
  throw new Error(`no free port near ${preferred} for PostgreSQL`);
}

/** Port of a cluster already running from `dataDir` (line 4 of postmaster.pid), if alive. */
function runningPort(dataDir: string): number | null {
  const pidFile = path.join(dataDir, "postmaster.pid");
  if (!existsSync(pidFile)) return null;
  const lines = readFileSync(pidFile, "utf8").split("\n");
  try {
    process.kill(Number(lines[0]), 0);
    return Number(lines[3]);
  } catch {
    return null;
  }
}

/**
 * Initialises (once) and starts a loopback-only cluster in `baseDir`; reuses it if already
 * running. `stop()` stops it only if this call started it.
 */
export async function startEmbeddedPostgres(baseDir: string, preferredPort = 54329): Promise<EmbeddedPostgres> {
  const bin = ensurePostgresInstalled();
  const dataDir = path.join(baseDir, "data");
  makeOwnedDir(path.dirname(baseDir));
  makeOwnedDir(baseDir);
  if (!existsSync(path.join(dataDir, "PG_VERSION"))) {
    makeOwnedDir(dataDir);
    runAsOwner(path.join(bin, "initdb"), ["-D", dataDir, "-A", "trust", "-U", "postgres", "-E", "UTF8", "--locale=C"]);
  }
  const alreadyRunning = runningPort(dataDir);
  const port = alreadyRunning ?? (await freePort(preferredPort));
  if (!alreadyRunning) {
    accessSync(baseDir, constants.R_OK);
    runAsOwner(path.join(bin, "pg_ctl"), [
      "-D", dataDir, "-l", path.join(baseDir, "server.log"), "-w", "-t", "60",
      "-o", `-p ${port} -k ${baseDir} -c listen_addresses=127.0.0.1 -c max_connections=300 -c fsync=on`,
      "start",
    ]);
  }
  let stopped = false;
  return {
    adminUrl: `postgres://postgres@127.0.0.1:${port}/postgres`,
    port,
    stop() {
      if (alreadyRunning || stopped) return;
      stopped = true;
      try {
        runAsOwner(path.join(bin, "pg_ctl"), ["-D", dataDir, "-m", "fast", "-w", "stop"]);
      } catch (error) {
        console.error(`[postgres] stop failed: ${(error as Error).message}`);
      }
    },
  };
}
