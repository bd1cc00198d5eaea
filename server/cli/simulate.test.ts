import { describe, expect, it } from "vitest";
import { mechweave } from "../../tests/support/cli";

const fixtures = "tests/fixtures/dynamics";
// Each call starts a node process: seconds apiece on a busy machine.
const slow = { timeout: 120_000 };

describe("mechweave simulate", slow, () => {
  it("prints the time course of a mechanism as JSON", async () => {
    const { code, stdout } = await mechweave("simulate", `${fixtures}/robertson.weave`, "--until", "40", "--samples", "5", "--rtol", "1e-8", "--atol", "1e-14", "--json");
    expect(code).toBe(0);
    const result = JSON.parse(stdout);
    expect(Object.keys(result)).toEqual(["t", "series", "stats"]);
    expect(Object.keys(result.stats)).toEqual(["steps", "rejected", "jacobians", "factorizations", "method", "engine", "ms"]);
    expect(result.t).toEqual([0, 10, 20, 30, 40]);
    expect(result.series.A[4]).toBeCloseTo(0.7158, 4);
  });

  it("simulates a polynomial ODE file", async () => {
    const { code, stdout } = await mechweave("simulate", `${fixtures}/lorenz.ode`, "--until", "1", "--samples", "3", "--method", "explicit", "--json");
    expect(code).toBe(0);
    expect(Object.keys(JSON.parse(stdout).series)).toEqual(["x", "y", "z"]);
  });

  it("exits 1 for a file with errors or a missing rate coefficient, without a stack trace", async () => {
    const broken = await mechweave("simulate", `${fixtures}/broken.weave`, "--until", "1");
    expect(broken.code).toBe(1);
    expect(broken.stderr).toMatch(/broken\.weave:1:10: error: .*negative/);
    const missing = await mechweave("simulate", `${fixtures}/missing-rate.weave`, "--until", "1", "--json");
    expect(missing.code).toBe(1);
    expect(JSON.parse(missing.stdout).error).toMatch(/no rate coefficient for C -> E \+ P \(line 2\)/);
    const ode = await mechweave("simulate", `${fixtures}/broken.ode`, "--until", "1");
    expect(ode.code).toBe(1);
    expect(ode.stderr).toMatch(/broken\.ode:1:\d+: error/);
    expect(broken.stderr + missing.stderr + ode.stderr).not.toMatch(/\n\s+at /);
  });

  it("simulates the network the analysis describes when a rate coefficient is 0, from the file or --set", async () => {
    const fromFile = await mechweave("simulate", "tests/fixtures/zero-rate.weave", "--until", "40", "--samples", "2", "--json");
    expect(fromFile.code).toBe(0);
    expect(fromFile.stderr).toMatch(/zero-rate\.weave:2:1: warning: rate coefficient 0: forward direction left out of the network/);
    expect(JSON.parse(fromFile.stdout).series.B[1]).toBeLessThan(1e-9);
    const set = await mechweave("simulate", "tests/fixtures/michaelis-menten.weave", "--set", "kcat=0", "--until", "1", "--samples", "2", "--json");
    expect(set.code).toBe(0);
    expect(JSON.parse(set.stdout).series.P).toEqual([0, 0]);
  });

  it("exits 2 on bad usage", async () => {
    expect((await mechweave("simulate", `${fixtures}/robertson.weave`, "--until", "soon")).code).toBe(2);
    expect((await mechweave("simulate", `${fixtures}/robertson.weave`, "--samples", "3")).code).toBe(2);
    expect((await mechweave("simulate", "missing.weave", "--until", "1")).code).toBe(2);
  });
});

describe("mechweave simulate --stochastic", slow, () => {
  const birthDeath = `${fixtures}/birth-death.weave`;
  const ensemble = (...extra: string[]) => mechweave("simulate", birthDeath, "--stochastic", "--volume", "4", "--runs", "200", "--until", "8", "--samples", "3", ...extra);

  it("prints mean, variance and paths of copy numbers as JSON, the same for the same seed", async () => {
    const first = await ensemble("--seed", "7", "--json");
    expect(first.code).toBe(0);
    const result = JSON.parse(first.stdout);
    expect(Object.keys(result)).toEqual(["t", "mean", "variance", "paths", "stats"]);
    expect(result.t).toEqual([0, 4, 8]);
    expect(result.paths).toHaveLength(3);
    // Poisson with mean kV/g = 20 by t = 8: four standard errors of 200 runs.
    expect(Math.abs(result.mean.X[2] - 20)).toBeLessThan(4 * Math.sqrt(20 / 200));
    expect(result.stats).toMatchObject({ runs: 200, method: "direct", volume: 4 });
    expect(JSON.parse((await ensemble("--seed", "7", "--json")).stdout).mean).toEqual(result.mean);
  });

  it("refuses hostile options with exit 2 and a rate law with exit 1", async () => {
    const zero = await ensemble("--seed", "1", "--runs", "0");
    expect(zero.code).toBe(2);
    expect(zero.stderr).toMatch(/--runs: the number of runs must be a whole number from 1 to 10,000/);
    expect((await ensemble("--volume", "1")).stderr).toMatch(/--seed is required with --stochastic/);
    const law = await mechweave("simulate", `${fixtures}/enzyme.weave`, "--stochastic", "--volume", "10", "--runs", "2", "--seed", "1", "--until", "1", "--json");
    expect(law.code).toBe(1);
    expect(JSON.parse(law.stdout).error).toMatch(/stochastic runs take mass-action steps only; 0 -> S \(line 5\) has a rate law/);
  });
});

describe("mechweave lyapunov", slow, () => {
  it("estimates the largest exponent of the Lorenz system", async () => {
    const { code, stdout } = await mechweave("lyapunov", `${fixtures}/lorenz.ode`, "--until", "300", "--json");
    expect(code).toBe(0);
    const result = JSON.parse(stdout);
    expect(result.largest).toBeGreaterThan(0.8);
    expect(result.largest).toBeLessThan(1);
    expect(Array.isArray(result.history)).toBe(true);
  });

  it("copes with a renormalisation interval over which the tangent vector would overflow", async () => {
    const { code, stdout } = await mechweave("lyapunov", `${fixtures}/lorenz.ode`, "--until", "2000", "--interval", "790", "--json");
    expect(code).toBe(0);
    expect(Math.abs(JSON.parse(stdout).largest / 0.9056 - 1)).toBeLessThan(0.03);
  });
});
