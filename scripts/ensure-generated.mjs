// Generated files are not committed: the Lezer parser of the grammar and the WebAssembly engine of
// the mass-action integrator (AssemblyScript). Build each on first use, so the CLI, the tests and
// the dev server work after a bare `npm install` too. Silent when each is newer than its sources.
import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const engineSources = path.join(root, "app/chem/kinetics/wasm/assembly");

const targets = [
  {
    output: path.join(root, "grammar/parser.js"),
    sources: [path.join(root, "grammar/mechanism.grammar")],
    command: ["lezer-generator", "grammar/mechanism.grammar", "-o", "grammar/parser.js"],
  },
  {
    output: path.join(root, "app/chem/kinetics/wasm/engine.wasm"),
    sources: readdirSync(engineSources).map((name) => path.join(engineSources, name)),
    // The stub runtime: a bump allocator the engine resets per run, no garbage collector.
    command: ["asc", "app/chem/kinetics/wasm/assembly/engine.ts", "--outFile", "app/chem/kinetics/wasm/engine.wasm", "--runtime", "stub", "-O3", "--noAssert"],
  },
];

for (const { output, sources, command } of targets) {
  const newest = Math.max(...sources.map((file) => statSync(file).mtimeMs));
  if (existsSync(output) && statSync(output).mtimeMs >= newest) continue;
  const result = spawnSync("npx", command, { cwd: root, stdio: ["ignore", "ignore", "inherit"] });
  if (result.status !== 0) process.exit(result.status ?? 1);
}
