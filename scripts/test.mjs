// `npm test`: the same set-up as `npm start` for a separate test cluster, then every test.
import { spawn } from "node:child_process";
import { build, ensureDebianPackage, ensureDependencies, projectRoot } from "./prepare.mjs";

ensureDependencies();
ensureDebianPackage("postgresql", "/usr/lib/postgresql");
ensureDebianPackage("chromium", "/usr/bin/chromium");
// The LaTeX export is checked by compiling it.
ensureDebianPackage("texlive-latex-base", "/usr/bin/pdflatex");
// Every SBML export is checked by libSBML through its Perl binding (tests/support/libsbml-check.pl);
// the module's own path names the Perl version, so dpkg's record of the package is the probe.
ensureDebianPackage("libsbml5-perl", "/var/lib/dpkg/info/libsbml5-perl.list");
build();

const runner = spawn(process.execPath, ["--import", "tsx", "tests/support/run-tests.ts", ...process.argv.slice(2)], {
  cwd: projectRoot,
  stdio: "inherit",
  env: { ...process.env, NODE_ENV: "test" },
});
runner.on("exit", (code) => process.exit(code ?? 1));
