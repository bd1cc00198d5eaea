// What `new Worker(…)` runs for a worker thread. The build (scripts/bundle.mjs) puts every entry,
// the server's and the threads', as plain JavaScript side by side in build/: a process started
// from there starts its threads from the bundle beside it, with no TypeScript to transform.
// `npm run dev` and the unit tests run the source under tsx, and a thread needs tsx too: on Node 20
// `execArgv: ["--import", "tsx"]` does not reach a worker's entry file and ESM loader hooks do not
// apply inside workers, but tsx's CommonJS require hook does, so such a thread boots through it.
import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";

export interface WorkerScript {
  /** The file to run, or (with `eval`) the code to evaluate. */
  script: string | URL;
  eval: boolean;
}

/** True in the source (this file is TypeScript); false once bundled into build/*.js. */
const fromSource = import.meta.url.endsWith(".ts");

/** The thread entry `source` (a .ts file), or when bundled the file `bundle` beside this bundle. */
export function workerScript(source: URL, bundle: string): WorkerScript {
  if (!fromSource) return { script: new URL(`./${bundle}`, import.meta.url), eval: false };
  const tsx = createRequire(import.meta.url).resolve("tsx/cjs/api");
  return { script: [`require(${JSON.stringify(tsx)}).register();`, `require(${JSON.stringify(fileURLToPath(source))});`].join("\n"), eval: true };
}
