import { describe, expect, it } from "vitest";
import { mechweave } from "../../tests/support/cli";

const schloegl = "tests/fixtures/dynamics/schloegl.weave";
// Each call is quick from the prebuilt bundle, seconds apiece under tsx on a busy machine.
const slow = { timeout: 120_000 };

describe("mechweave continue", slow, () => {
  it("follows Schlögl's equilibria through both folds, p = 6 ± 2/(3√3), as JSON", async () => {
    const { code, stdout } = await mechweave("continue", schloegl, "--vary", "k4", "--from", "5", "--to", "7", "--json");
    expect(code).toBe(0);
    const result = JSON.parse(stdout);
    expect(Object.keys(result.points[0])).toEqual(["value", "state", "stable"]);
    expect(result.bifurcations.map((b: { kind: string; value: number }) => [b.kind, b.value.toFixed(6)])).toEqual([
      ["fold", (6 + 2 / (3 * Math.sqrt(3))).toFixed(6)],
      ["fold", (6 - 2 / (3 * Math.sqrt(3))).toFixed(6)],
    ]);
  });

  it("varies a held species with --set applied, and prints a table without --json", async () => {
    // With k4 = 1 the feed k4·[B] runs over the same values as k4 did: the same folds.
    const { code, stdout } = await mechweave("continue", schloegl, "--vary", "[B]", "--from", "5", "--to", "7", "--set", "k4=1");
    expect(code).toBe(0);
    expect(stdout.split("\n")[0]).toBe("value\tX\tstability");
    expect(stdout).toMatch(/# fold at 6\.384900/);
  });

  it("samples the Hopf curve b = 1 + a² of the Brusselator with a second parameter", async () => {
    const { code, stdout } = await mechweave("continue", "tests/fixtures/brusselator.weave", "--vary", "[B]", "--from", "0.5", "--to", "4", "--vary2", "[A]", "--from2", "0.5", "--to2", "1.5", "--steps", "2", "--json");
    expect(code).toBe(0);
    const result = JSON.parse(stdout);
    expect(result.values).toEqual([0.5, 1.5]);
    expect(result.bifurcations.map((b: { kind: string; value: number; second: number }) => [b.kind, b.second, b.value.toFixed(6)])).toEqual([
      ["hopf", 0.5, "1.250000"],
      ["hopf", 1.5, "3.250000"],
    ]);
  });

  it("exits 2 on bad usage", async () => {
    expect((await mechweave("continue", schloegl, "--vary", "nothing", "--from", "5", "--to", "7")).stderr).toMatch(/--vary nothing: not a parameter/);
    expect((await mechweave("continue", schloegl, "--vary", "k4", "--from", "5")).code).toBe(2);
    expect((await mechweave("continue", schloegl, "--vary", "k4", "--from", "5", "--to", "5")).code).toBe(2);
  });
});
