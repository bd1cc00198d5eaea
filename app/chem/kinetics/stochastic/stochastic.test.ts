import { expm, matrix, multiply, type Matrix } from "mathjs";
import { describe, expect, it } from "vitest";
import { massAction } from "../../../../tests/fixtures/dynamics/models";
import { SimulationInputError } from "../errors";
import { simulateNetwork } from "../simulate";
import { mergeTallies, simulateEnsemble, summarizeTally, type StochasticMethod } from "./ensemble";

const METHODS: StochasticMethod[] = ["direct", "next-reaction"];

function ensemble(model: ReturnType<typeof massAction>, options: Parameters<typeof simulateEnsemble>[2]) {
  return summarizeTally(simulateEnsemble(model.mechanism, model.network, options), options.volume);
}

describe("the birth–death process ∅ → X (k), X → ∅ (γ)", () => {
  // Its stationary law is Poisson with mean kΩ/γ (e.g. Gardiner, Stochastic Methods, §11.1: the
  // master equation of a birth–death process); here kΩ/γ = 5·4/1 = 20 copies.
  const model = massAction(["X"], [[{}, { X: 1 }, 5], [{ X: 1 }, {}, 1]], { X: 0 });
  const runs = 2000;

  for (const method of METHODS) {
    it(`settles to mean = variance = kΩ/γ (${method})`, () => {
      const result = ensemble(model, { volume: 4, until: 12, samples: 4, seed: 11, runs, method });
      const mean = result.mean.X.at(-1)!;
      const variance = result.variance.X.at(-1)!;
      // Four standard errors: of the mean √(20/runs); of the variance √((μ₄ − σ⁴)/runs), μ₄ = λ(1 + 3λ) for a Poisson law.
      expect(Math.abs(mean - 20)).toBeLessThan(4 * Math.sqrt(20 / runs));
      expect(Math.abs(variance - 20)).toBeLessThan(4 * Math.sqrt((20 * 61 - 400) / runs));
      expect(result.mean.X[0]).toBe(0);
    });
  }
});

describe("the dimerisation 2A ⇄ B against its exact master equation", () => {
  // Ω = 2 and [A]0 = 5 give 10 copies of A; with 2B + A = 10 conserved the chain has six states,
  // b = 0…5. The propensity of 2A → B is k·nA(nA − 1)/Ω, of B → 2A it is k'·nB.
  const volume = 2;
  const [k, kBack, until] = [1, 0.7, 0.4];
  const model = massAction(["A", "B"], [[{ A: 2 }, { B: 1 }, k], [{ B: 1 }, { A: 2 }, kBack]], { A: 5 });

  /**
   * Mean and variance of nA at `until` from the master equation p' = Qᵀp, solved by mathjs' matrix
   * exponential; `pairs(nA)` counts the ordered pairs of A the forward step can take.
   */
  function exactMoments(pairs = (a: number) => a * (a - 1)) {
    const states = 6;
    const generator = Array.from({ length: states }, () => new Array<number>(states).fill(0));
    for (let b = 0; b < states; b++) {
      const a = 10 - 2 * b;
      const forward = (k * pairs(a)) / volume;
      const backward = kBack * b;
      if (b + 1 < states) [generator[b][b + 1], generator[b][b]] = [forward, generator[b][b] - forward];
      if (b > 0) [generator[b][b - 1], generator[b][b]] = [backward, generator[b][b] - backward];
    }
    const transposed = generator[0].map((_, j) => generator.map((row) => row[j] * until));
    const start = Array.from({ length: states }, (_, b) => (b === 0 ? 1 : 0));
    const p = (multiply(expm(matrix(transposed)), matrix(start)) as Matrix).toArray() as number[];
    const mean = p.reduce((sum, pb, b) => sum + pb * (10 - 2 * b), 0);
    const square = p.reduce((sum, pb, b) => sum + pb * (10 - 2 * b) ** 2, 0);
    return { mean, variance: square - mean * mean, p };
  }

  for (const method of METHODS) {
    it(`matches the exact mean and variance of nA at t = ${until} (${method})`, () => {
      const exact = exactMoments();
      expect(exact.p.reduce((a, b) => a + b)).toBeCloseTo(1, 12);
      // scipy.linalg.expm on the same generator gives 2.863376 (checked once by hand).
      expect(exact.mean).toBeCloseTo(2.863376, 5);
      const runs = 4000;
      const result = ensemble(model, { volume, until, samples: 2, seed: 5, runs, method });
      const mean = result.mean.A[1];
      const variance = result.variance.A[1];
      expect(Math.abs(mean - exact.mean)).toBeLessThan(4 * Math.sqrt(exact.variance / runs));
      // nA ≤ 10, so the fourth central moment is below 10² σ²: a generous bound on the variance's error.
      expect(Math.abs(variance - exact.variance)).toBeLessThan(4 * Math.sqrt((100 * exact.variance) / runs));
      // n² in place of n(n − 1) would move the exact mean (to 2.376) far past these bounds: the check can fail.
      expect(Math.abs(exactMoments((a) => a * a).mean - exact.mean)).toBeGreaterThan(4 * 4 * Math.sqrt(exact.variance / runs));
    });
  }
});

describe("large volumes", () => {
  it("bring the mean concentration to the deterministic time course", () => {
    // A + B → C with C → A + B and A → ∅: nonlinear, so the mean of the process is not the ODE's
    // solution at small Ω; at Ω = 5000 the two agree to within a percent.
    const model = massAction(["A", "B", "C"], [[{ A: 1, B: 1 }, { C: 1 }, 2], [{ C: 1 }, { A: 1, B: 1 }, 0.5], [{ A: 1 }, {}, 0.3]], { A: 1, B: 0.8 });
    const volume = 5000;
    const stochastic = ensemble(model, { volume, until: 3, samples: 7, seed: 3, runs: 20, method: "next-reaction" });
    const deterministic = simulateNetwork(model.mechanism, model.network, { until: 3, samples: 7, rtol: 1e-9, atol: 1e-12 });
    for (const name of ["A", "B", "C"]) {
      stochastic.mean[name].forEach((copies, i) => expect(Math.abs(copies / volume - deterministic.series[name][i])).toBeLessThan(0.01));
    }
  });
});

describe("the direct method and the next reaction method", () => {
  it("agree in distribution on a small reversible network", () => {
    const model = massAction(
      ["A", "B", "C"],
      [[{ A: 1, B: 1 }, { C: 1 }, 1], [{ C: 1 }, { A: 1, B: 1 }, 2], [{}, { A: 1 }, 3], [{ A: 1 }, {}, 0.5], [{ B: 2 }, { B: 1 }, 0.1]],
      { A: 2, B: 6 },
    );
    const runs = 1500;
    const options = { volume: 3, until: 2, samples: 5, seed: 21, runs };
    const direct = ensemble(model, { ...options, method: "direct" });
    const next = ensemble(model, { ...options, method: "next-reaction" });
    for (const name of ["A", "B", "C"]) {
      for (let i = 1; i < 5; i++) {
        const pooled = (direct.variance[name][i] + next.variance[name][i]) / 2;
        // The difference of two independent means: standard error √(2σ²/runs); five of them.
        expect(Math.abs(direct.mean[name][i] - next.mean[name][i])).toBeLessThan(5 * Math.sqrt((2 * pooled) / runs) + 1e-9);
        expect(direct.variance[name][i] / next.variance[name][i]).toBeGreaterThan(0.8);
        expect(direct.variance[name][i] / next.variance[name][i]).toBeLessThan(1.25);
      }
    }
  });
});

describe("seeded runs", () => {
  const model = massAction(["X", "Y"], [[{}, { X: 1 }, 4], [{ X: 1 }, { Y: 1 }, 1], [{ X: 1, Y: 1 }, { Y: 1 }, 0.2]], { X: 1 });
  const options = { volume: 10, until: 5, samples: 11, seed: 99 };

  it("give the same answer for the same seed, and another for another seed", () => {
    const once = ensemble(model, { ...options, runs: 30 });
    expect(ensemble(model, { ...options, runs: 30 })).toEqual({ ...once, stats: { ...once.stats, ms: expect.any(Number) } });
    expect(ensemble(model, { ...options, seed: 100, runs: 30 }).mean).not.toEqual(once.mean);
  });

  it("give the same answer however the runs are split", () => {
    const whole = summarizeTally(simulateEnsemble(model.mechanism, model.network, { ...options, runs: 30 }), 10);
    const parts = [{ first: 0, runs: 2 }, { first: 2, runs: 17 }, { first: 19, runs: 11 }].map((range) => simulateEnsemble(model.mechanism, model.network, { ...options, ...range }));
    const merged = summarizeTally(mergeTallies(parts.reverse()), 10);
    expect(merged.mean).toEqual(whole.mean);
    expect(merged.variance).toEqual(whole.variance);
    expect(merged.paths).toEqual(whole.paths);
    expect(merged.paths).toHaveLength(3);
    expect(merged.stats.events).toBe(whole.stats.events);
  });
});

describe("refusals", () => {
  it("names a rate law, a bad volume, too many copies and a spent event budget", () => {
    const model = massAction(["X"], [[{}, { X: 1 }, 1000]], { X: 1 });
    const base = { until: 10, samples: 3, seed: 1, runs: 1 };
    const withLaw = massAction(["X"], [[{ X: 1 }, {}, null]], {});
    withLaw.network.reactions[0].law = "X / (1 + X)";
    expect(() => simulateEnsemble(withLaw.mechanism, withLaw.network, { ...base, volume: 1 })).toThrow(/mass-action steps only; X -> 0 \(line 1\) has a rate law/);
    expect(() => simulateEnsemble(model.mechanism, model.network, { ...base, volume: 0 })).toThrow(SimulationInputError);
    expect(() => simulateEnsemble(model.mechanism, model.network, { ...base, volume: Number.NaN })).toThrow(/volume must be a positive number/);
    expect(() => simulateEnsemble(model.mechanism, model.network, { ...base, volume: 1e10 })).toThrow(/\[X\] starts at more than 1e\+9 copies/);
    expect(() => simulateEnsemble(model.mechanism, model.network, { ...base, volume: 1, maxEvents: 500 })).toThrow(/run 0 took 500 reaction events and reached only t = 0\.\d+ of 10/);
  });

  it("runs a network with nothing to fire to the end", () => {
    const model = massAction(["X"], [[{ X: 2 }, {}, 1]], { X: 0.5 });
    for (const method of METHODS) {
      const result = ensemble(model, { volume: 2, until: 1, samples: 3, seed: 1, runs: 2, method });
      expect(result.mean.X).toEqual([1, 1, 1]);
      expect(result.variance.X).toEqual([0, 0, 0]);
    }
  });
});
