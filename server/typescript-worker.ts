// Source for `new Worker(source, { eval: true })` that runs a TypeScript entry file. The server and
// the tests run TypeScript through tsx, and a worker needs the same: on Node 20
// `execArgv: ["--import", "tsx"]` does not reach a worker's entry file and ESM loader hooks do not
// apply inside workers, but tsx's CommonJS require hook does, so the worker boots through it.
import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";

export function typescriptWorkerSource(entry: URL): string {
  return [
    `require(${JSON.stringify(createRequire(import.meta.url).resolve("tsx/cjs/api"))}).register();`,
    `require(${JSON.stringify(fileURLToPath(entry))});`,
  ].join("\n");
}
