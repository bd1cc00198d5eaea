import { Solver } from "odex";
import { describe, expect, it } from "vitest";
import { mechweave } from "../../tests/support/cli";

// `--set` on the real command line: a temperature T in expression coefficients and an initial value.
const file = "tests/fixtures/dynamics/arrhenius.weave";
// Up to four processes a test; each is quick from the bundle, seconds apiece under tsx on a busy machine.
const slow = { timeout: 120_000 };

/**
 * The same scheme written out by hand as ODEs and integrated by odex (Hairer's GBS extrapolation
 * code, an npm port independent of ours), with every coefficient computed here from T.
 */
function reference(T: number, initial: { A: number; B: number }, until: number, samples: number): Record<string, number[]> {
  const k1 = 2.0e6 * Math.sqrt(T) * Math.exp(-6000 / T);
  const k2 = 1.0e8 * Math.exp(-12000 / T);
  const k3 = 5.0e4;
  const k3b = 1.0e3 * Math.exp(-2000 / T);
  const f = (_t: number, [A, B, C, D, E]: number[]) => {
    const [v1, v2, v3, v3b] = [k1 * A * B, k2 * C, k3 * D * B, k3b * E];
    return [-v1 + v2, -v1 - v3 + v3b, v1 - v2, v2 - v3 + v3b, v3 - v3b];
  };
  const solver = new Solver(5);
  solver.absoluteTolerance = 1e-18;
  solver.relativeTolerance = 1e-12;
  solver.denseOutput = true;
  const rows: number[][] = [];
  solver.solve(f, 0, [initial.A, initial.B, 0, 0, 0], until, solver.grid(until / (samples - 1), (_t, y) => rows.push([...y])));
  return Object.fromEntries(["A", "B", "C", "D", "E"].map((name, j) => [name, rows.map((row) => row[j])]));
}

describe("mechweave --set", slow, () => {
  it("simulates at two temperatures as an independent integrator does, to 1e-5 relative", async () => {
    for (const [T, A0] of [[900, 1e-3], [1100, 2e-3]]) {
      const run = await mechweave("simulate", file, "--set", `T=${T}`, "--set", `[A]0=${A0}`, "--until", "0.05", "--samples", "11", "--rtol", "1e-10", "--atol", "1e-18", "--json");
      expect(run.stderr).toBe("");
      expect(run.code).toBe(0);
      const ours = JSON.parse(run.stdout).series as Record<string, number[]>;
      const theirs = reference(T, { A: A0, B: 2e-3 }, 0.05, 11);
      for (const name of Object.keys(theirs)) {
        theirs[name].forEach((value, i) => expect(Math.abs(ours[name][i] - value)).toBeLessThanOrEqual(1e-5 * Math.abs(value) + 1e-16));
      }
    }
  });

  it("analyze and lyapunov take it too; a name the file does not have is bad usage", async () => {
    const analyzed = await mechweave("analyze", file, "--set", "T=0", "--json");
    // T = 0 divides by zero in every Arrhenius coefficient: the file is reported, not run.
    expect(analyzed.code).toBe(1);
    expect(JSON.parse(analyzed.stdout).diagnostics[0].message).toMatch(/Division by zero in -6000\/T/);
    expect((await mechweave("lyapunov", file, "--set", "T=1100", "--until", "0.01", "--json")).code).toBe(0);
    const unknown = await mechweave("simulate", file, "--set", "Tk=1100", "--until", "1");
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/--set Tk: .* has no such parameter or species/);
  });
});
