// Database-backed tests get their server from scripts/test.mjs; pure unit tests need only the
// generated files (the grammar's parser, the WebAssembly engine), built here when stale.
import { spawnSync } from "node:child_process";

export default function setup() {
  const result = spawnSync(process.execPath, ["scripts/ensure-generated.mjs"], { stdio: "inherit" });
  if (result.status !== 0) throw new Error("generating the parser or the WebAssembly engine failed");
}
