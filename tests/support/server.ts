// A real Mechweave server process on a free port, against its own database, seeded with the demo
// workspace: its owner is the one account that may read the local mail catcher. Servers and job
// workers run from the bundles in build/ that `npm test` builds first, as `npm run serve` and
// `npm run worker` do.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { createTestDatabase } from "./database";

const projectRoot = path.resolve(import.meta.dirname, "../..");

export interface TestServer {
  url: string;
  databaseUrl: string;
  /** Ends the process the way an operator would (SIGTERM). */
  stop(): Promise<void>;
  /** kill -9: no clean shutdown at all. */
  crash(): Promise<void>;
  /** Starts a fresh process on the same database (after crash or stop). */
  restart(): Promise<void>;
  logs(): string;
}

/** Starts `bundle` and resolves with the first group of `ready` in its output. */
function spawnBundle(bundle: string, env: Record<string, string>, ready: RegExp) {
  const child = spawn(process.execPath, [path.join("build", bundle)], {
    cwd: projectRoot,
    env: { ...process.env, NODE_ENV: "test", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  const started = new Promise<string>((resolve, reject) => {
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      const match = output.match(ready);
      if (match) resolve(match[1]);
    };
    child.stdout!.on("data", onData);
    child.stderr!.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.on("exit", (code) => reject(new Error(`${bundle} exited (${code}) before it was ready:\n${output}`)));
  });
  return { child, ready: started, output: () => output };
}

function launch(databaseUrl: string, extraEnv: Record<string, string>, port = 0) {
  const env = { DATABASE_URL: databaseUrl, PORT: String(port), HOST: "127.0.0.1", SEED_DEMO: "1", ...extraEnv };
  return spawnBundle("mechweave-server.js", env, /listening on (http:\/\/[\d.]+:\d+)/);
}

function waitExit(child: ChildProcess) {
  // A process killed by a signal keeps exitCode null.
  const exited = child.exitCode !== null || child.signalCode !== null;
  return new Promise<void>((resolve) => (exited ? resolve() : child.once("exit", () => resolve())));
}

export interface TestServerOptions {
  /** The server reaches its database through this URL instead (e.g. a proxy that can go down). */
  databaseUrl?: (url: string) => string;
}

export async function startTestServer(extraEnv: Record<string, string> = {}, options: TestServerOptions = {}): Promise<TestServer & { dispose(): Promise<void> }> {
  const database = await createTestDatabase();
  const server = await startInstance(options.databaseUrl?.(database.url) ?? database.url, extraEnv);
  return {
    ...server,
    databaseUrl: database.url,
    async dispose() {
      await server.stop();
      await database.drop();
    },
  };
}

/**
 * One more server process on an existing database (another app instance beside a test server);
 * start instances one after another, as each applies migrations and seeds an empty database.
 */
export async function startInstance(databaseUrl: string, extraEnv: Record<string, string> = {}): Promise<TestServer> {
  let current = launch(databaseUrl, extraEnv);
  const url = await current.ready;
  const port = Number(new URL(url).port);
  let logs = "";
  return {
    url,
    databaseUrl,
    async stop() {
      current.child.kill("SIGTERM");
      await waitExit(current.child);
    },
    async crash() {
      current.child.kill("SIGKILL");
      await waitExit(current.child);
    },
    async restart() {
      logs += current.output();
      current = launch(databaseUrl, extraEnv, port);
      await current.ready;
    },
    logs: () => logs + current.output(),
  };
}

export interface TestWorker {
  /** The instance id it printed (`worker ready: ID`). */
  id: string;
  stop(): Promise<void>;
  logs(): string;
}

/** A `npm run worker` process on a test server's database. */
export async function startTestWorker(databaseUrl: string, extraEnv: Record<string, string> = {}): Promise<TestWorker> {
  const worker = spawnBundle("mechweave-worker.js", { DATABASE_URL: databaseUrl, ...extraEnv }, /worker ready: (\S+)/);
  const id = await worker.ready;
  return {
    id,
    async stop() {
      worker.child.kill("SIGTERM");
      await waitExit(worker.child);
    },
    logs: worker.output,
  };
}
