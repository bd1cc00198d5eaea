import { describe, expect, it } from "vitest";
import { mechweave } from "../../tests/support/cli";

// Each call starts a node process: seconds apiece on a busy machine.
describe("mechweave analyze", { timeout: 120_000 }, () => {
  it("prints the contract JSON and exits 0 for a clean file", async () => {
    const { code, stdout } = await mechweave("analyze", "tests/fixtures/michaelis-menten.weave", "--json");
    expect(code).toBe(0);
    const report = JSON.parse(stdout);
    expect(report).toMatchObject({
      diagnostics: [],
      species: ["E", "S", "C", "P"],
      complexes: ["E + S", "C", "E + P"],
      rank: 2,
      deficiency: 0,
      linkageClassDeficiencies: [0],
      reversible: false,
      weaklyReversible: false,
      massConserving: true,
      theorems: { deficiencyZero: { applies: true }, deficiencyOne: { applies: true } },
    });
    expect(report.odes.P).toBe("kcat*C");
  });

  it("carries the behaviour verdicts: siphons, acr and multistationarity with a witness that verifies", async () => {
    const { code, stdout } = await mechweave("analyze", "tests/fixtures/two-site-phosphorylation.weave", "--json");
    expect(code).toBe(0);
    const report = JSON.parse(stdout);
    // The three conserved totals (substrate, kinase, phosphatase), each in species order.
    expect(report.siphons).toEqual([["S0", "ES0", "S1", "ES1", "S2", "FS2", "FS1"], ["E", "ES0", "ES1"], ["F", "FS2", "FS1"]]);
    expect(report.acr).toEqual([]);
    expect(report.multistationarity.verdict).toBe("possible");
    expect(report.multistationarity.witness.rates).toHaveLength(report.reactions.length);
    expect(report.multistationarity.witness.equilibria.length).toBeGreaterThanOrEqual(2);
  });

  it("exits 1 for a file with errors and still lists them in the JSON", async () => {
    const { code, stdout } = await mechweave("analyze", "tests/fixtures/broken.weave", "--json");
    expect(code).toBe(1);
    const report = JSON.parse(stdout);
    expect(report.diagnostics[0]).toMatchObject({ severity: "error", line: 1, column: 5 });
    expect(report.complexes).toEqual(["Y", "Z", "0"]);
  });

  it("prints a readable report without --json", async () => {
    const { code, stdout } = await mechweave("analyze", "tests/fixtures/triangle.weave");
    expect(code).toBe(0);
    expect(stdout).toContain("Rank 2, deficiency 0");
    expect(stdout).toContain("k1*k3*k5 = k2*k4*k6  (holds)");
  });

  it("exits 2 on bad usage, without a stack trace", async () => {
    for (const args of [["tests/fixtures/missing.weave", "--json"], ["tests/fixtures/triangle.weave", "--verbose"], []]) {
      const { code, stderr } = await mechweave("analyze", ...args);
      expect(code).toBe(2);
      expect(stderr).not.toMatch(/\n\s+at /);
    }
  });

  it("leaves a step with rate coefficient 0 out of the network, whether the file or --set makes it 0", async () => {
    const fromFile = JSON.parse((await mechweave("analyze", "tests/fixtures/zero-rate.weave", "--json")).stdout);
    expect(fromFile.diagnostics).toMatchObject([{ severity: "warning", line: 2, message: "rate coefficient 0: forward direction left out of the network" }]);
    expect(fromFile).toMatchObject({ complexes: ["A", "B"], reactions: [{ from: 1, to: 0, rate: 1 }], weaklyReversible: false, reversible: false });
    expect(fromFile.odes).toEqual({ A: "k2*B", B: "-k2*B" });

    const set = await mechweave("analyze", "tests/fixtures/michaelis-menten.weave", "--set", "kcat=0", "--set", "[S]0=2e-3", "--json");
    expect(set.code).toBe(0);
    const report = JSON.parse(set.stdout);
    expect(report.diagnostics).toMatchObject([{ severity: "warning", line: 3, message: "rate coefficient 0: step left out of the network" }]);
    expect(report).toMatchObject({ complexes: ["E + S", "C"], weaklyReversible: true, deficiency: 0 });
    expect(report.species).toEqual(["E", "S", "C", "P"]);
    expect(report.odes.P).toBe("0");
  });

  it("exits 2 for a --set that names nothing in the file or has no number", async () => {
    for (const setting of ["[Q]0=1", "kcat=-1"]) {
      const { code, stderr } = await mechweave("analyze", "tests/fixtures/michaelis-menten.weave", "--set", setting, "--json");
      expect(code).toBe(2);
      expect(stderr).toMatch(/--set/);
    }
  });
});
