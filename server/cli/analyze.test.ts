import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";

// The real command line, as scripts and acceptance checks call it.
function analyze(...args: string[]) {
  const result = spawnSync("npx", ["tsx", "server/cli/main.ts", "analyze", ...args], { encoding: "utf8" });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe("mechweave analyze", () => {
  it("prints the contract JSON and exits 0 for a clean file", () => {
    const { code, stdout } = analyze("tests/fixtures/michaelis-menten.weave", "--json");
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

  it("exits 1 for a file with errors and still lists them in the JSON", () => {
    const { code, stdout } = analyze("tests/fixtures/broken.weave", "--json");
    expect(code).toBe(1);
    const report = JSON.parse(stdout);
    expect(report.diagnostics[0]).toMatchObject({ severity: "error", line: 1, column: 5 });
    expect(report.complexes).toEqual(["Y", "Z", "0"]);
  });

  it("prints a readable report without --json", () => {
    const { code, stdout } = analyze("tests/fixtures/triangle.weave");
    expect(code).toBe(0);
    expect(stdout).toContain("Rank 2, deficiency 0");
    expect(stdout).toContain("k1*k3*k5 = k2*k4*k6  (holds)");
  });

  it("exits 2 on bad usage, without a stack trace", () => {
    for (const args of [["tests/fixtures/missing.weave", "--json"], ["tests/fixtures/triangle.weave", "--verbose"], []]) {
      const { code, stderr } = analyze(...args);
      expect(code).toBe(2);
      expect(stderr).not.toMatch(/\n\s+at /);
    }
  });
});
