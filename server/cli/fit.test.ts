import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { mechweave } from "../../tests/support/cli";

const fixtures = "tests/fixtures/fit";
const model = `${fixtures}/consecutive.weave`;
const data = ["--data", `${fixtures}/consecutive-run-1.csv`, "--data", `${fixtures}/consecutive-run-2.csv`];
// Each call starts a node process: seconds apiece on a busy machine.
const slow = { timeout: 180_000 };

describe("mechweave fit", slow, () => {
  it("estimates the varied coefficients from several data sets, from a poor start given by --set", async () => {
    const { code, stdout } = await mechweave("fit", model, ...data, "--vary", "k1,k2", "--vary", "k3", "--set", "k1=2", "--set", "k3=1", "--json");
    expect(code).toBe(0);
    const result = JSON.parse(stdout);
    expect(Object.keys(result)).toEqual(["parameters", "cost", "iterations", "converged", "correlation", "warnings"]);
    expect(Object.keys(result.parameters.k1)).toEqual(["value", "stderr", "low", "high"]);
    expect(result.converged).toBe(true);
    for (const [name, truth] of Object.entries({ k1: 0.8, k2: 0.3, k3: 2 })) {
      expect(result.parameters[name].low).toBeLessThan(truth);
      expect(result.parameters[name].high).toBeGreaterThan(truth);
    }
    expect(result.correlation.k2.k3).toBeCloseTo(result.correlation.k3.k2, 12);
  });

  it("exits 1 with a clear message for an unknown parameter, a bad CSV or a species the model lacks", async () => {
    const unknown = await mechweave("fit", model, ...data, "--vary", "k9", "--json");
    expect(unknown.code).toBe(1);
    expect(JSON.parse(unknown.stdout).error).toMatch(/unknown parameter k9; its parameters are k1, k2, k3/);
    const folder = mkdtempSync(join(tmpdir(), "mechweave-fit-"));
    writeFileSync(join(folder, "bad.csv"), "time,B\n0,0\n1,abc\n");
    writeFileSync(join(folder, "stranger.csv"), "time,B,Q\n0,0,1\n1,0.2,1\n");
    const bad = await mechweave("fit", model, "--data", join(folder, "bad.csv"), "--vary", "k1");
    expect(bad.code).toBe(1);
    expect(bad.stderr).toMatch(/bad\.csv: line 3, column "B": "abc" is not a number/);
    const stranger = await mechweave("fit", model, "--data", join(folder, "stranger.csv"), "--vary", "k1");
    expect(stranger.code).toBe(1);
    expect(stranger.stderr).toMatch(/stranger\.csv: the column "Q" is not a species of the model/);
    expect(unknown.stderr + bad.stderr + stranger.stderr).not.toMatch(/\n\s+at /);
  });

  it("exits 2 on bad usage", async () => {
    expect((await mechweave("fit", model, "--vary", "k1")).code).toBe(2);
    expect((await mechweave("fit", model, ...data)).code).toBe(2);
    expect((await mechweave("fit", model, "--data", "missing.csv", "--vary", "k1")).code).toBe(2);
  });
});

describe("mechweave sensitivity", slow, () => {
  it("prints normalized sensitivities for every named rate coefficient by default", async () => {
    const { code, stdout } = await mechweave("sensitivity", model, "--until", "2", "--samples", "3", "--json");
    expect(code).toBe(0);
    const result = JSON.parse(stdout);
    expect(Object.keys(result)).toEqual(["t", "normalized"]);
    expect(result.t).toEqual([0, 1, 2]);
    expect(Object.keys(result.normalized.B)).toEqual(["k1", "k2", "k3"]);
    // A decays as e^(−k1·t): ∂ln A/∂ln k1 = −k1·t exactly.
    expect(result.normalized.A.k1[2]).toBeCloseTo(-1.6, 5);
    expect(result.normalized.B.k1[0]).toBeNull();
  });

  it("takes --vary, and refuses an unknown parameter or a missing --until", async () => {
    const { code, stdout } = await mechweave("sensitivity", model, "--until", "1", "--samples", "2", "--vary", "[A]0,k2", "--json");
    expect(code).toBe(0);
    expect(Object.keys(JSON.parse(stdout).normalized.C)).toEqual(["[A]0", "k2"]);
    const unknown = await mechweave("sensitivity", model, "--until", "1", "--vary", "kx");
    expect(unknown.code).toBe(1);
    expect(unknown.stderr).toMatch(/unknown parameter kx/);
    expect((await mechweave("sensitivity", model, "--samples", "3")).code).toBe(2);
  });
});
