import { readFileSync } from "node:fs";
import { levenbergMarquardt as libraryFit } from "ml-levenberg-marquardt";
import { describe, expect, it } from "vitest";
import { SimulationCancelled } from "~/chem/kinetics/errors";
import type { Mechanism } from "~/chem/model";
import { parseMechanism } from "~/chem/parse";
import { experimentCsv, NOISE_SD, odexCourses, TIMES, TRUE_COEFFICIENTS } from "../../../tests/fixtures/fit/consecutive-data";
import { readExperimentCsv } from "./experiment-csv";
import { fitMechanism } from "./fit";
import type { Experiment, FitProgress } from "./types";

const text = readFileSync(new URL("../../../tests/fixtures/fit/consecutive.weave", import.meta.url), "utf8");
/** The text with every coefficient 1.6–2.5 times off its true value: where each fit starts. */
const start: Mechanism = parseMechanism(text.replace("k1 = 0.8", "k1 = 2").replace("k2 = 0.3", "k2 = 0.5").replace("k3 = 2.0", "k3 = 1")).mechanism;
const vary = ["k1", "k2", "k3"];

function experiments(withSd: boolean): Experiment[] {
  return [
    readExperimentCsv(experimentCsv(1, 11, withSd), "run-1", { species: start.species }).experiment,
    readExperimentCsv(experimentCsv(0.5, 12, withSd), "run-2", { species: start.species }).experiment,
  ];
}

describe("fitting against data from an independent integrator", () => {
  const data = experiments(false);

  it("recovers the coefficients the data were made with, within their intervals", () => {
    const result = fitMechanism(start, { vary, experiments: data });
    expect(result.converged).toBe(true);
    expect(result.points).toBe(120);
    for (const [name, truth] of Object.entries(TRUE_COEFFICIENTS)) {
      const fitted = result.parameters[name];
      expect(Math.abs(fitted.value - truth) / truth, name).toBeLessThan(0.05);
      expect(fitted.low).toBeLessThan(truth);
      expect(fitted.high).toBeGreaterThan(truth);
    }
    // Unweighted: the residual variance estimates the noise put in.
    expect(Math.sqrt((2 * result.cost) / (result.points - 3)) / NOISE_SD).toBeCloseTo(1, 0);
    expect(result.residuals.map((r) => Object.keys(r.species))).toEqual([["B", "C"], ["B", "C"]]);
    expect(result.correlation.k1.k1).toBe(1);
  });

  it("agrees with ml-levenberg-marquardt on odex simulations: optimum to 0.1 % of the cost, standard errors to 30 %", () => {
    const ours = fitMechanism(start, { vary, experiments: data, rtol: 1e-9 });
    const measured = data.flatMap((e) => e.time.flatMap((_, i) => [e.series.B[i] as number, e.series.C[i] as number]));
    const model = (k: number[]): number[] =>
      data.flatMap((e) => odexCourses(k, e.settings.initial.A, TIMES).flatMap((row) => [row[1], row[2]]));
    // The library asks point by point, alternating between parameter vectors: one simulation each.
    const cache = new Map<string, number[]>();
    const valuesAt = (k: number[]) => {
      const key = k.join(",");
      if (!cache.has(key)) cache.set(key, model(k));
      return cache.get(key) as number[];
    };
    const library = libraryFit({ x: measured.map((_, i) => i), y: measured }, (k: number[]) => (i: number) => valuesAt(k)[i], {
      initialValues: [2, 0.5, 1],
      gradientDifference: 1e-6,
      centralDifference: true,
      damping: 1e-2,
      maxIterations: 100,
      errorTolerance: 0,
      minValues: [1e-6, 1e-6, 1e-6],
      maxValues: [100, 100, 100],
    });
    const k = library.parameterValues;
    const residual = (values: number[]) => values.map((v, i) => v - measured[i]);
    const libraryCost = residual(model(k)).reduce((s, r) => s + r * r, 0) / 2;
    const oursAtOdex = residual(model(vary.map((name) => ours.parameters[name].value))).reduce((s, r) => s + r * r, 0) / 2;
    expect(Math.abs(oursAtOdex - libraryCost) / libraryCost).toBeLessThan(1e-3);
    expect(Math.abs(ours.cost - libraryCost) / libraryCost).toBeLessThan(1e-3);

    // The library reports no standard errors: s²·(JᵀJ)⁻¹ from a central-difference Jacobian of the odex model at its optimum.
    const J = k.map((value, j) => {
      const h = value * 1e-5;
      const up = model(k.map((v, i) => (i === j ? v + h : v)));
      const down = model(k.map((v, i) => (i === j ? v - h : v)));
      return up.map((u, i) => (u - down[i]) / (2 * h));
    });
    const A = J.map((a) => J.map((b) => a.reduce((s, x, i) => s + x * b[i], 0)));
    const variance = (2 * libraryCost) / (measured.length - 3);
    const inverse = invert3(A);
    vary.forEach((name, j) => {
      const libraryStderr = Math.sqrt(variance * inverse[j][j]);
      expect(Math.abs(ours.parameters[name].stderr / libraryStderr - 1), name).toBeLessThan(0.3);
      expect(Math.abs(ours.parameters[name].value / k[j] - 1), name).toBeLessThan(1e-3);
    });
  }, 60_000);

  it("weighs by the standard deviations given in sd(X) columns: the cost is then about half the number of points", () => {
    const result = fitMechanism(start, { vary, experiments: experiments(true) });
    expect(result.weighted).toBe(true);
    expect(result.cost / (result.points / 2)).toBeGreaterThan(0.7);
    expect(result.cost / (result.points / 2)).toBeLessThan(1.3);
    const unweighted = fitMechanism(start, { vary, experiments: data });
    // Equal deviations everywhere: the same optimum, and the same errors up to the estimated variance.
    expect(result.parameters.k1.value).toBeCloseTo(unweighted.parameters.k1.value, 6);
  });

  it("reports progress and stops when cancelled", () => {
    const seen: FitProgress[] = [];
    fitMechanism(start, { vary, experiments: data }, { onProgress: (p) => seen.push(p) });
    expect(seen.length).toBeGreaterThan(2);
    expect(seen[0].iteration).toBe(0);
    expect(seen.at(-1)?.cost).toBeLessThan(seen[0].cost);
    const controller = new AbortController();
    const cancelled = () => fitMechanism(start, { vary, experiments: data }, { signal: controller.signal, onProgress: (p) => p.iteration === 1 && controller.abort() });
    expect(cancelled).toThrow(SimulationCancelled);
  });

  it("respects bounds in log space", () => {
    const result = fitMechanism(start, { vary, experiments: data, bounds: { k1: { high: 0.5 } } });
    expect(result.parameters.k1.value).toBeCloseTo(0.5, 10);
    expect(result.parameters.k1.atBound).toBe(true);
    expect(result.warnings.join(" ")).toMatch(/k1 ended on its bound/);
  });
});

describe("identifiability and bad input", () => {
  it("says in words when two coefficients only act as their sum", () => {
    const twin = parseMechanism("r1: A -> B @ ka\nr2: A -> B @ kb\nr3: B -> C @ k2\nka = 0.3\nkb = 0.3\nk2 = 0.3\n[A]0 = 1\n").mechanism;
    const result = fitMechanism(twin, { vary: ["ka", "kb", "k2"], experiments: experiments(false) });
    const words = result.warnings.join(" ");
    expect(words).toMatch(/ka and kb are anti-correlated \(r = -1.0000\)/);
    expect(words).toMatch(/nearly singular.*ka, kb/);
  });

  it("refuses an unknown parameter, a species the model lacks and a varied setting", () => {
    const data = experiments(false);
    expect(() => fitMechanism(start, { vary: ["k9"], experiments: data })).toThrow(/unknown parameter k9/);
    const stranger = { ...data[0], series: { Q: data[0].series.B } };
    expect(() => fitMechanism(start, { vary, experiments: [stranger] })).toThrow(/"Q" is not a species/);
    expect(() => fitMechanism(start, { vary: ["[A]0"], experiments: data })).toThrow(/run-1 sets \[A\]0, which the fit varies/);
    expect(() => readExperimentCsv("time,B,Q\n0,1,1\n", "x", { species: start.species })).toThrow(/"Q" is not a species/);
    expect(() => readExperimentCsv("time,B,sd(B),C\n1,1,0.1,1\n", "x", { species: start.species })).toThrow(/sd\(C\)/);
  });
});

function invert3(A: number[][]): number[][] {
  const [[a, b, c], [d, e, f], [g, h, i]] = A;
  const det = a * (e * i - f * h) - b * (d * i - f * g) + c * (d * h - e * g);
  return [
    [(e * i - f * h) / det, (c * h - b * i) / det, (b * f - c * e) / det],
    [(f * g - d * i) / det, (a * i - c * g) / det, (c * d - a * f) / det],
    [(d * h - e * g) / det, (b * g - a * h) / det, (a * e - b * d) / det],
  ];
}
