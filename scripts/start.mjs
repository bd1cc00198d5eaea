// `npm start`: everything from a fresh checkout to the app on http://127.0.0.1:3000.
import { spawn } from "node:child_process";
import { build, ensureDebianPackage, ensureDependencies, projectRoot } from "./prepare.mjs";

ensureDependencies();
ensureDebianPackage("postgresql", "/usr/lib/postgresql");
build();

const server = spawn(process.execPath, ["build/mechweave-server.js"], {
  cwd: projectRoot,
  stdio: "inherit",
  env: { NODE_ENV: "production", ...process.env },
});
for (const signal of ["SIGINT", "SIGTERM"]) process.on(signal, () => server.kill(signal));
server.on("exit", (code) => process.exit(code ?? 0));
