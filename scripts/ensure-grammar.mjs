// The generated parser is not committed; build it on first use so the CLI works after a bare
// `npm install` too. Silent when it is already there and newer than the grammar.
import { spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const grammar = path.join(root, "grammar/mechanism.grammar");
const parser = path.join(root, "grammar/parser.js");
if (!existsSync(parser) || statSync(parser).mtimeMs < statSync(grammar).mtimeMs) {
  const result = spawnSync("npx", ["lezer-generator", grammar, "-o", parser], { cwd: root, stdio: ["ignore", "ignore", "inherit"] });
  if (result.status !== 0) process.exit(result.status ?? 1);
}
