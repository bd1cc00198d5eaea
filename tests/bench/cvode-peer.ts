// SUNDIALS CVODE (C; BDF, Newton, dense LU, analytic Jacobian) as the higher peer of the dynamics
// benchmarks: `cvode-peer.c` is compiled with gcc against Debian's libsundials-dev when both are
// there (`apt-get install -y libsundials-dev`), and run on the very same systems. Like Python, it
// is only a peer here; the product never needs it.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { PeerFigures, PeerProblem } from "./scipy-peer";

const SOURCE = join(import.meta.dirname, "cvode-peer.c");
const HEADER = "/usr/include/cvode/cvode.h";
const LIBRARIES = ["-lsundials_cvode", "-lsundials_nvecserial", "-lsundials_sunlinsoldense", "-lsundials_sunmatrixdense", "-lm"];

/** The problems as the driver reads them: whitespace-separated numbers (see cvode-peer.c). */
function driverInput(problems: PeerProblem[], runs: (problem: PeerProblem) => number): string {
  const numbers: (number | string)[] = [problems.length];
  for (const p of problems) {
    const { spec } = p;
    numbers.push(spec.names.length, spec.monomials.length);
    for (const m of spec.monomials) numbers.push(m.coefficient, m.factors.length, ...m.factors.flatMap((f) => [f.variable, f.power]));
    numbers.push(spec.changes.length, ...spec.changes.flatMap((c) => [c.variable, c.rate, c.change]));
    numbers.push(...spec.initial, p.until, p.rtol, p.atol, runs(p));
  }
  // String(x) round-trips a double exactly; scanf's %lf reads it back bit for bit.
  return numbers.map(String).join(" ") + "\n";
}

/** Runs each problem `runs(problem)` times with CVODE; null (and a note) when gcc or SUNDIALS is missing. */
export function cvodePeer(problems: PeerProblem[], runs: (problem: PeerProblem) => number): PeerFigures[] | null {
  if (problems.some((p) => p.spec.custom.length > 0)) throw new Error("the CVODE peer takes mass-action systems only");
  if (!existsSync(HEADER)) {
    console.log("(CVODE skipped: no SUNDIALS headers; apt-get install -y libsundials-dev)");
    return null;
  }
  const directory = mkdtempSync(join(tmpdir(), "mechweave-cvode-"));
  try {
    const driver = join(directory, "cvode-peer");
    const build = spawnSync("gcc", ["-O2", "-o", driver, SOURCE, ...LIBRARIES], { encoding: "utf8" });
    if (build.status !== 0) {
      console.log(`(CVODE skipped: the driver did not build: ${build.error?.message ?? build.stderr.trim().split("\n")[0]})`);
      return null;
    }
    const run = spawnSync(driver, [], { input: driverInput(problems, runs), encoding: "utf8", maxBuffer: 64 << 20 });
    if (run.status !== 0) {
      console.log(`(CVODE could not run: ${run.stderr.trim() || `exit ${run.status}`})`);
      return null;
    }
    return run.stdout
      .trim()
      .split("\n")
      .map((line) => {
        const [ms, steps, jacobians, ...final] = line.split(" ").map(Number);
        return { ms, steps, jacobians, final };
      });
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}
