// Runs the real CLI as scripts do. Sources: Lorenz (1963) and Rössler (1976) for the systems,
// Hárs and Tóth (1979) for the negative cross effect criterion and the canonical realization.
import { describe, expect, it, vi } from "vitest";
import { buildNetwork } from "~/chem/network";
import { parseOde } from "~/chem/ode/parse";
import * as P from "~/chem/ode/polynomial";
import { parseMechanism } from "~/chem/parse";
import { massActionOf } from "~/chem/realize/from-network";
import { inducedRhs } from "~/chem/realize/mass-action";
import { mechweave } from "../../tests/support/cli";
import { readArguments, run } from "./realize";

const realize = (...args: string[]) => mechweave("realize", ...args);

const fixture = (name: string) => `tests/fixtures/ode/${name}`;
const pairs = (effects: { equation: string; term: string }[]) => effects.map(({ equation, term }) => ({ equation, term }));

// Up to two processes a test, quick from the bundle but seconds apiece under tsx on a busy machine.
describe("mechweave realize", { timeout: 120_000 }, () => {
  it("Lorenz: not kinetic because of -x*z in y', with a suggested shift", async () => {
    const { code, stdout } = await realize(fixture("lorenz.ode"), "--json");
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out).toMatchObject({ kinetic: false, mechanism: null, maxOrder: null });
    expect(pairs(out.negativeCrossEffects)).toEqual([{ equation: "y", term: "-x*z" }]);
    expect(out.negativeCrossEffects[0].spans[0]).toMatchObject({ line: 7, column: 6 });
    for (const v of ["x", "y", "z"]) expect(out.boundingBox[v].min + out.suggestedShift[v]).toBeGreaterThan(0);
    // The multiplier is for the shifted ODE, where x' and z' have cross effects too.
    expect(out.suggestedMultiplier).toEqual({ x: 1, y: 1, z: 1 });
  });

  it("Lorenz in words: the multiplier goes with the suggested shift, and the mechanism's clock is explained", async () => {
    const plain = await realize(fixture("lorenz.ode"));
    expect(plain.stdout).toContain("smallest multiplier: --multiply=x*y*z (with the suggested shift)");
    const { code, stdout } = await realize(fixture("lorenz.ode"), "--shift", "--multiply");
    expect(code).toBe(0);
    expect(stdout).toMatch(/note: The mechanism runs on another clock: its time s and the ODE's time t satisfy dt = x\*y\*z · ds/);
    expect(stdout).toMatch(/\n# .*Simulate it until s = 0\.00\d+ to cover the ODE's 0 ≤ t ≤ 50/);
  });

  it("Lorenz shifted and multiplied: order five, and the mechanism's ODE is the transformed ODE", async () => {
    const { code, stdout } = await realize(fixture("lorenz.ode"), "--shift", "x=30,y=40,z=10", "--multiply", "--json");
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out).toMatchObject({ kinetic: true, maxOrder: 5, negativeCrossEffects: [], original: { kinetic: false } });
    expect(out.notes.join(" ")).toContain("only supported numerically, not proved");
    expect(out.clock).toMatchObject({ multiplier: "x*y*z", originalUntil: 50, basis: "trajectory" });
    expect(out.clock.suggestedUntil).toBeGreaterThan(0);
    expect(out.clock.suggestedUntil).toBeLessThan(1);
    const transformed = parseOde(out.transformedOde).exact!;
    const read = parseMechanism(out.mechanism);
    expect(read.diagnostics).toEqual([]);
    const induced = inducedRhs(massActionOf(buildNetwork(read.mechanism)));
    // The text carries doubles; compare with the transformed ODE's coefficients as doubles, exactly.
    transformed.rhs.forEach((p, i) => expect(P.equals(induced[i], P.fromMonomials(P.toMonomials(p)))).toBe(true));
  });

  it("--shift without a value uses the suggested shift", async () => {
    const out = JSON.parse((await realize(fixture("rossler.ode"), "--shift", "--multiply", "--json")).stdout);
    expect(out.transformations[0]).toEqual({ kind: "translation", shift: out.suggestedShift });
    expect(out.kinetic).toBe(true);
  });

  it("Rössler: -y and -z in x'", async () => {
    const out = JSON.parse((await realize(fixture("rossler.ode"), "--json")).stdout);
    expect(pairs(out.negativeCrossEffects)).toEqual([
      { equation: "x", term: "-y" },
      { equation: "x", term: "-z" },
    ]);
  });

  it("Lotka–Volterra is kinetic; its canonical realization has one step per term", async () => {
    const out = JSON.parse((await realize(fixture("lotka-volterra.ode"), "--json")).stdout);
    expect(out).toMatchObject({ kinetic: true, negativeCrossEffects: [], maxOrder: 2, reactions: 4 });
    expect(out.mechanism).toContain("x -> 2x @ 2");
    expect(out.mechanism).toContain("y -> 0 @ 3");
  });

  it("Lotka–Volterra with 2y as a candidate: the sparse realization is the textbook X → 2X, X + Y → 2Y, Y → 0", async () => {
    const { code, stdout } = await realize(fixture("lotka-volterra.ode"), "--equivalents", "--complexes", "2y", "--json");
    expect(code).toBe(0);
    const { sparse } = JSON.parse(stdout).equivalents;
    expect(sparse).toMatchObject({ status: "found", reactions: 3, optimal: true });
    const steps = sparse.mechanism.split("\n").filter((l: string) => l.includes("->")).map((l: string) => l.replace(/ @ .*/, ""));
    expect(steps.sort()).toEqual(["x + y -> 2y", "x -> 2x", "y -> 0"]);
  });

  it("exits 1 with diagnostics for errors in the file", async () => {
    const bad = await realize(fixture("not-polynomial.ode"), "--json");
    expect(bad.code).toBe(1);
    expect(JSON.parse(bad.stdout).diagnostics[0]).toMatchObject({ line: 2, message: expect.stringContaining("division") });
  });

  it("exits 2 on bad usage, without a stack trace", async () => {
    const usage = await realize("--json");
    expect(usage.code).toBe(2);
    expect(usage.stderr).toContain("usage: mechweave realize");
    expect(usage.stderr).not.toMatch(/\n\s+at /);
  });
});

// The same shell in-process, for the other bad usages (a process start costs seconds on a busy machine).
describe("run", () => {
  it.each([
    [[fixture("lorenz.ode"), "--shift", "w=3"], "which the ODE does not have"],
    [[fixture("lorenz.ode"), "--frobnicate"], "unknown option --frobnicate"],
    [["missing.ode"], "cannot read missing.ode"],
    [[fixture("lotka-volterra.ode"), "--equivalents", "--complexes", "2w"], "not a variable of the ODE"],
    [[fixture("lotka-volterra.ode"), "--complexes", "2y"], "go with --equivalents"],
  ])("exits 2 for %j", async (args, message) => {
    const errors: string[] = [];
    const write = vi.spyOn(process.stderr, "write").mockImplementation((chunk) => (errors.push(String(chunk)), true));
    try {
      expect(await run(args)).toBe(2);
    } finally {
      write.mockRestore();
    }
    expect(errors.join("")).toContain(message);
    expect(errors.join("")).not.toMatch(/\n\s+at /);
  });
});

describe("readArguments", () => {
  it("reads --shift with a value, without one, and before the file", () => {
    expect(readArguments(["f.ode", "--shift", "x=20,y=30"]).request.shift).toEqual({ x: 20, y: 30 });
    expect(readArguments(["f.ode", "--shift=x=1.5"]).request.shift).toEqual({ x: 1.5 });
    expect(readArguments(["--shift", "f.ode"])).toMatchObject({ file: "f.ode", request: { shift: "suggested" } });
    expect(() => readArguments(["f.ode", "--shift", "x=abc"])).toThrow(/cannot read the shift/);
  });

  it("reads --multiply alone and with a monomial", () => {
    expect(readArguments(["f.ode", "--multiply"]).request.multiply).toBe(true);
    expect(readArguments(["f.ode", "--multiply=x*y^2"]).request.multiply).toEqual({ x: 1, y: 2 });
    expect(() => readArguments(["f.ode", "--multiply=x+y"])).toThrow(/cannot read the multiplier/);
  });
});
