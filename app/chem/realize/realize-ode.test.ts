// The API entry point. Sources: Lorenz (1963); Hárs and Tóth (1979); Feinberg (1987) for the
// deficiency-zero network A ⇌ 2B, A + C ⇌ D ⇌ B + E.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "../analysis";
import { buildNetwork } from "../network";
import { parseMechanism } from "../parse";
import { simulateNetwork, simulatePolynomialOde } from "../kinetics/simulate";
import { negativeCrossEffects } from "../ode/cross-effects";
import { toPolynomialOde } from "../ode/exact";
import { parseOde } from "../ode/parse";
import { equivalentRealizationsOfMechanism } from "./equivalents";
import { realizeOde, RealizeRequestError } from "./realize-ode";

const lorenz = readFileSync("tests/fixtures/ode/lorenz.ode", "utf8");

describe("realizeOde", () => {
  it("realizes Lorenz with the suggested shift and the product of the variables, at order five", async () => {
    const result = await realizeOde({ ode: lorenz, shift: "suggested", multiply: true });
    expect(result).toMatchObject({ kinetic: true, maxOrder: 5, original: { kinetic: false, degree: 2 } });
    expect(result.transformations.map((t) => t.kind)).toEqual(["translation", "multiplication"]);
    expect(result.notes.join("\n")).toMatch(/only supported numerically, not proved: the simulated trajectory .* stays in it/);
    expect(result.transformedOde).toContain("x(0) = 22");
  });

  it("says when a given shift is too small for the simulated trajectory", async () => {
    const result = await realizeOde({ ode: lorenz, shift: { x: 1, y: 1, z: 1 }, multiply: true });
    expect(result.kinetic).toBe(true);
    expect(result.notes.join("\n")).toContain("leaves it (in x, y");
  });

  it("suggests the smallest multiplier for the shift asked for, and a smaller multiplier gives lower-order steps", async () => {
    // Unshifted, Rössler's only negative cross effects are in x', so multiplying by x alone removes
    // them; the shift it would be offered brings cross effects in every equation.
    const rossler = readFileSync("tests/fixtures/ode/rossler.ode", "utf8");
    expect((await realizeOde({ ode: rossler })).suggestedMultiplier).toEqual({ x: 1, y: 1, z: 1 });
    const unshifted = await realizeOde({ ode: rossler, shift: { x: 0, y: 0, z: 0 } });
    expect(unshifted.suggestedMultiplier).toEqual({ x: 1 });
    const byX = await realizeOde({ ode: rossler, multiply: { x: 1 } });
    const byAll = await realizeOde({ ode: rossler, multiply: true });
    expect(byX).toMatchObject({ kinetic: true, maxOrder: 3 });
    expect(byAll).toMatchObject({ kinetic: true, maxOrder: 5 });
  });

  it("offers for Lorenz the multiplier that removes every negative cross effect after the proposed shift", async () => {
    // Before the shift only y' has one (-x*z), so "y" alone would leave -70*y in x' and two in z'.
    const offered = await realizeOde({ ode: lorenz });
    expect(offered.suggestedMultiplier).toEqual({ x: 1, y: 1, z: 1 });
    const applied = await realizeOde({ ode: lorenz, shift: offered.suggestedShift!, multiply: offered.suggestedMultiplier });
    const transformed = parseOde(applied.transformedOde!).exact!;
    expect(negativeCrossEffects(transformed)).toEqual([]);
    expect(applied.kinetic).toBe(true);
  });

  it("carries the clock: the mechanism at the suggested end time is where the shifted ODE is at its horizon", async () => {
    // Over 0 ≤ t ≤ 1 Lorenz is not yet chaotic, so the two end states can be compared.
    const result = await realizeOde({ ode: lorenz, shift: "suggested", multiply: true, until: 1 });
    expect(result.clock).toMatchObject({ multiplier: "x*y*z", originalUntil: 1, basis: "trajectory" });
    expect(result.mechanism).toMatch(/^# The mechanism runs on another clock: .* dt = x\*y\*z · ds.* until s = /m);
    const shifted = await realizeOde({ ode: lorenz, shift: result.suggestedShift!, until: 1 });
    const ode = simulatePolynomialOde(toPolynomialOde(parseOde(shifted.transformedOde!).exact!), { until: 1, samples: 2, rtol: 1e-10, atol: 1e-10 });
    const { mechanism } = parseMechanism(result.mechanism!);
    const run = simulateNetwork(mechanism, buildNetwork(mechanism), { until: result.clock!.suggestedUntil!, samples: 2, rtol: 1e-10, atol: 1e-10 });
    for (const v of ["x", "y", "z"]) expect(run.series[v][1]).toBeCloseTo(ode.series[v][1], 2);
  });

  it("suggests an end time at which the realized Lorenz mechanism runs through", async () => {
    const result = await realizeOde({ ode: lorenz, shift: "suggested", multiply: true });
    expect(result.clock!.suggestedUntil).toBeGreaterThan(0.001);
    expect(result.clock!.suggestedUntil).toBeLessThan(0.02);
    const { mechanism } = parseMechanism(result.mechanism!);
    const run = simulateNetwork(mechanism, buildNetwork(mechanism), { until: result.clock!.suggestedUntil!, samples: 2 });
    expect(run.series.x.every(Number.isFinite)).toBe(true);
  });

  it("rejects a shift of a variable the ODE does not have", async () => {
    await expect(realizeOde({ ode: lorenz, shift: { w: 1 } })).rejects.toBeInstanceOf(RealizeRequestError);
  });

  it("returns the diagnostics of a faulty ODE", async () => {
    const result = await realizeOde({ ode: "x' = sin(x)\n" });
    expect(result.mechanism).toBeNull();
    expect(result.diagnostics[0]).toMatchObject({ line: 1, column: 6 });
  });
});

describe("equivalent realizations of a mechanism", () => {
  it("Feinberg's deficiency-zero network: dense contains its steps, and a weakly reversible one exists", async () => {
    const source = "A <=> 2B @ 2, 1\nA + C <=> D @ 3, 1\nD <=> B + E @ 5, 4\n";
    expect(await analyzeSource(source)).toMatchObject({ deficiency: 0, weaklyReversible: true });
    const found = await equivalentRealizationsOfMechanism(source, { timeLimitMs: 20_000 });
    for (const step of ["A -> 2B", "2B -> A", "A + C -> D", "D -> A + C", "D -> B + E", "B + E -> D"]) {
      expect(found.dense.mechanism).toContain(`\n${step} @`);
    }
    expect(found.sparse.status).toBe("found");
    expect(found.weaklyReversible.status).toBe("found");
  });

  it("finds a weakly reversible mechanism for a network that is not: 0 → 2X, X → 0 becomes 0 ⇌ X", async () => {
    // By hand: x' = 2 - 2x is also the ODE of 0 → X, X → 0 with both rates 2.
    const source = "0 -> 2X @ 1\nX -> 0 @ 2\n";
    expect(await analyzeSource(source)).toMatchObject({ weaklyReversible: false });
    const found = await equivalentRealizationsOfMechanism(source);
    const text = found.weaklyReversible.mechanism!;
    expect(await analyzeSource(text)).toMatchObject({ weaklyReversible: true, deficiency: 0 });
    expect(text).toContain("\n0 -> X @ 2\n");
    expect(text).toContain("\nX -> 0 @ 2\n");
  });

  it("refuses mechanisms it cannot take the mass-action ODE of", async () => {
    for (const source of ["S -> P @ { 2*S/(1 + S) }\n", "X -> 0\n", "X -> \n"]) {
      await expect(equivalentRealizationsOfMechanism(source)).rejects.toBeInstanceOf(RealizeRequestError);
    }
  });
});
