// `npm test`: the same set-up as `npm start` for a separate test cluster, then every test.
import { spawn } from "node:child_process";
import { build, ensureDebianPackage, ensureDependencies, projectRoot } from "./prepare.mjs";

ensureDependencies();
ensureDebianPackage("postgresql", "/usr/lib/postgresql");
ensureDebianPackage("chromium", "/usr/bin/chromium");
// The LaTeX export is checked by compiling it.
ensureDebianPackage("texlive-latex-base", "/usr/bin/pdflatex");
build();

const runner = spawn(process.execPath, ["--import", "tsx", "tests/support/run-tests.ts", ...process.argv.slice(2)], {
  cwd: projectRoot,
  stdio: "inherit",
  env: { ...process.env, NODE_ENV: "test" },
});
runner.on("exit", (code) => process.exit(code ?? 1));
