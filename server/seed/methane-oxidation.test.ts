import { Solver } from "odex";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { simulateNetwork } from "~/chem/kinetics/simulate";
import type { Network } from "~/chem/model";
import { buildNetwork } from "~/chem/network";
import { parseMechanism, parseMechanismWithSettings } from "~/chem/parse";
import { methaneOxidation } from "./methane-oxidation";

describe("the demo's methane oxidation", () => {
  it("reads without a diagnostic: about sixty steps, every one checked and balanced", async () => {
    const { mechanism, diagnostics } = parseMechanism(methaneOxidation.source);
    expect(diagnostics).toEqual([]);
    expect(mechanism.steps.length).toBeGreaterThanOrEqual(55);
    const report = await analyzeSource(methaneOxidation.source);
    expect(report.balance!.unreadable).toEqual([]);
    expect(report.balance!.steps.every((step) => step.checked && step.message === null)).toBe(true);
    expect(Object.values(mechanism.steps).some((step) => step.forward?.kind === "expression")).toBe(true);
  });

  /** Mass action written out by hand for odex, from the network's complexes and folded coefficients. */
  function odexSamples(network: Network, initial: number[], until: number, samples: number): number[][] {
    const derivative = (_t: number, y: number[]) => {
      const change = new Array<number>(y.length).fill(0);
      for (const reaction of network.reactions) {
        let rate = reaction.rate!;
        for (const { species, coefficient } of network.complexes[reaction.from].terms) rate *= y[species] ** coefficient;
        for (const { species, coefficient } of network.complexes[reaction.from].terms) change[species] -= coefficient * rate;
        for (const { species, coefficient } of network.complexes[reaction.to].terms) change[species] += coefficient * rate;
      }
      return change;
    };
    const solver = new Solver(initial.length);
    solver.relativeTolerance = 1e-10;
    solver.absoluteTolerance = 1e-30;
    solver.maxSteps = 1e6;
    // Sample by sample: odex's dense output is far slower on this problem than restarting.
    const rows = [initial];
    for (let i = 1; i < samples; i++) rows.push(solver.solve(derivative, (until * (i - 1)) / (samples - 1), rows[i - 1], (until * i) / (samples - 1)).y);
    return rows;
  }

  // An explicit code needs steps near the fastest time scale (about a microsecond here), so the
  // reference covers the first 0.2 ms: the chains start, every radical rises through many decades.
  // Each species is compared relative to its own scale (its largest value in the window).
  it.each([1000, 1200])("at T = %i K agrees with odex (Hairer's extrapolation code) to 1e-5 relative", (T) => {
    const { mechanism } = parseMechanismWithSettings(methaneOxidation.source, { parameters: { T }, initial: {} });
    const network = buildNetwork(mechanism);
    const until = 2e-4;
    const ours = simulateNetwork(mechanism, network, { until, samples: 11, rtol: 1e-10, atol: 1e-30, method: "stiff" });
    const theirs = odexSamples(network, network.species.map((name) => mechanism.initial[name] ?? 0), until, 11);
    expect(theirs).toHaveLength(11);
    network.species.forEach((name, j) => {
      const scale = Math.max(...theirs.map((row) => row[j]));
      expect(scale, name).toBeGreaterThan(0);
      for (let i = 1; i < 11; i++) {
        expect(Math.abs(ours.series[name][i] - theirs[i][j]), `${name} at sample ${i}`).toBeLessThanOrEqual(1e-5 * scale);
      }
    });
  }, 120_000);

  // Over the panel's whole 50 s horizon odex's explicit steps are too many; tests/bench/methane-radau.ts
  // checks the whole horizon against scipy's Radau (4e-10 of each species' scale). Here odex checks
  // that our trajectory still obeys the equations late in it: started from our state at t₀, it must
  // follow our solution over the next 0.2 ms.
  it.each([1, 50])("at 1100 K, from our state at t = %i s, odex follows our trajectory for 0.2 ms to 1e-5 relative", (start) => {
    const { mechanism } = parseMechanismWithSettings(methaneOxidation.source, { parameters: { T: 1100 }, initial: {} });
    const network = buildNetwork(mechanism);
    const window = 2e-4;
    const ours = simulateNetwork(mechanism, network, { until: start + window, samples: 2, rtol: 1e-10, atol: 1e-30, method: "stiff" });
    const atStart = simulateNetwork(mechanism, network, { until: start, samples: 2, rtol: 1e-10, atol: 1e-30, method: "stiff" });
    const from = network.species.map((name) => atStart.series[name].at(-1)!);
    const theirs = odexSamples(network, from, window, 2).at(-1)!;
    network.species.forEach((name, j) => {
      const scale = Math.max(Math.abs(from[j]), Math.abs(theirs[j]));
      expect(Math.abs(ours.series[name].at(-1)! - theirs[j]), name).toBeLessThanOrEqual(1e-5 * scale + 1e-30);
    });
  }, 120_000);
});
