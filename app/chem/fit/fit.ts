// Weighted nonlinear least squares of a mechanism against measured time courses: the chosen
// parameters move in log space (so they stay positive, and a rate coefficient known to a factor is
// a step of fixed size), every data set is an experiment run with its own settings, and each
// evaluation integrates state and sensitivities together, which gives the residuals and their
// Jacobian at once. The statistics follow the linearised model at the optimum: covariance
// s²·(JᵀJ)⁻¹ in log space, s² = 1 when standard deviations were given, else the residual variance
// 2·cost/(points − parameters), as general-purpose least-squares libraries report it.

import { eigs } from "mathjs";
import { SimulationInputError } from "~/chem/kinetics/errors";
import type { Mechanism } from "~/chem/model";
import { checkSettings, mechanismAt, mechanismWith, resolveParameters, valueOf, type Parameter } from "./parameters";
import { levenbergMarquardt, normalEquations, type Evaluation } from "./levenberg-marquardt";
import { integrateSensitivities, type Tolerances } from "./sensitivity";
import { fitRequestSchema, type Experiment, type ExperimentResiduals, type FitOptions, type FitRequest, type FitResult, type FittedParameter } from "./types";

/** The two-sided 95 % point of the normal distribution. */
const Z_95 = 1.959963984540054;
const DEFAULT_RTOL = 1e-7;
/** The default absolute tolerance, relative to the largest measured or initial concentration. */
const RELATIVE_ATOL = 1e-9;
const DEFAULT_MAX_ITERATIONS = 100;
/** Smallest/largest eigenvalue of the scaled Fisher matrix below which a combination is not determined. */
const SINGULAR_RATIO = 1e-10;
const HIGH_CORRELATION = 0.99;
const ROUND_OFF_EIGENVALUE = 1e-15;

interface Point {
  /** Index into the experiment's times. */
  time: number;
  species: number;
  measured: number;
  weight: number;
}

interface PreparedExperiment {
  experiment: Experiment;
  points: Point[];
}

export function fitMechanism(mechanism: Mechanism, request: FitRequest, options: FitOptions = {}): FitResult {
  const started = performance.now();
  const parsed = fitRequestSchema.safeParse(request);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new SimulationInputError(issue.path.length ? `${issue.path.join(".")}: ${issue.message}` : issue.message);
  }
  const { vary, experiments } = parsed.data;
  const parameters = resolveParameters(mechanism, vary);
  const P = parameters.length;
  const starts = parameters.map((p) => valueOf(mechanism, p));
  starts.forEach((value, j) => {
    if (!(value > 0)) throw new SimulationInputError(`${parameters[j].name} is ${value}: a varied parameter must start at a positive value (the search runs in its logarithm)`);
  });
  const { lower, upper } = logBounds(parameters, parsed.data.bounds ?? {});

  const weighted = experiments.every((e) => e.sd !== undefined);
  if (!weighted && experiments.some((e) => e.sd !== undefined)) throw new SimulationInputError("give standard deviations for every data set or for none");
  const prepared = experiments.map((e) => prepareExperiment(mechanism, parameters, e));
  const points = prepared.reduce((sum, e) => sum + e.points.length, 0);
  if (points <= P) throw new SimulationInputError(`${points} measured values cannot determine ${P} parameters: more values than parameters are needed`);

  const rtol = parsed.data.rtol ?? DEFAULT_RTOL;
  const atol = parsed.data.atol ?? RELATIVE_ATOL * concentrationScale(mechanism, experiments);
  const tolerances = { rtol, atol };
  // Beside residuals and Jacobian, the simulated values: the residual report needs them at the optimum.
  const evaluate = (theta: Float64Array): Evaluation & { simulated: number[][] } => {
    const values = theta.map(Math.exp);
    const residuals = new Float64Array(points);
    const jacobian = new Float64Array(points * P);
    const simulated: number[][] = [];
    let row = 0;
    for (const { experiment, points: list } of prepared) {
      const at = mechanismWith(mechanismAt(mechanism, parameters, values), experiment.settings);
      const courses = integrateSensitivities(at, parameters, experiment.time, tolerances, options);
      const n = courses.names.length;
      const own: number[] = [];
      for (const point of list) {
        const x = courses.states[point.time][point.species];
        own.push(x);
        residuals[row] = (x - point.measured) / point.weight;
        const s = courses.sensitivities[point.time];
        for (let j = 0; j < P; j++) jacobian[row * P + j] = s[j * n + point.species] / point.weight;
        row++;
      }
      simulated.push(own);
    }
    return { residuals, jacobian, simulated };
  };

  const start = Float64Array.from(starts, Math.log);
  const search = levenbergMarquardt(evaluate, start, {
    lower,
    upper,
    maxIterations: parsed.data.maxIterations ?? DEFAULT_MAX_ITERATIONS,
    signal: options.signal,
    onIteration: (iteration, cost) => options.onProgress?.({ iteration, cost }),
  });

  const statistics = linearisedStatistics(search.evaluation, P, weighted ? 1 : (2 * search.cost) / (points - P));
  const warnings = identifiabilityWarnings(parameters, statistics);
  if (!search.converged) warnings.unshift(`The search did not converge: ${search.stopped}.`);
  const fitted: Record<string, FittedParameter> = {};
  parameters.forEach((p, j) => {
    const value = Math.exp(search.theta[j]);
    const sigma = statistics.sigma[j];
    const atBound = search.theta[j] <= lower[j] || search.theta[j] >= upper[j];
    if (atBound) warnings.push(`${p.name} ended on its bound; its interval assumes it were free.`);
    fitted[p.name] = { start: starts[j], value, stderr: value * sigma, low: value * Math.exp(-Z_95 * sigma), high: value * Math.exp(Z_95 * sigma), atBound };
  });
  const correlation: FitResult["correlation"] = {};
  parameters.forEach((a, i) => (correlation[a.name] = Object.fromEntries(parameters.map((b, j) => [b.name, statistics.correlation[i * P + j]]))));

  return {
    parameters: fitted,
    cost: search.cost,
    iterations: search.iterations,
    converged: search.converged,
    stopped: search.stopped,
    correlation,
    weighted,
    points,
    residuals: residualReport(mechanism, prepared, search.evaluation.simulated, search.evaluation.residuals),
    warnings,
    ms: Math.round(performance.now() - started),
  };
}

function logBounds(parameters: Parameter[], bounds: NonNullable<FitRequest["bounds"]>): { lower: Float64Array; upper: Float64Array } {
  for (const name of Object.keys(bounds)) {
    if (!parameters.some((p) => p.name === name)) throw new SimulationInputError(`a bound is given for ${name}, which is not varied`);
  }
  const lower = Float64Array.from(parameters, (p) => Math.log(bounds[p.name]?.low ?? 0));
  const upper = Float64Array.from(parameters, (p) => Math.log(bounds[p.name]?.high ?? Number.POSITIVE_INFINITY));
  parameters.forEach((p, j) => {
    if (!(lower[j] < upper[j])) throw new SimulationInputError(`${p.name}: the lower bound must be below the upper bound`);
  });
  return { lower, upper };
}

function prepareExperiment(mechanism: Mechanism, parameters: Parameter[], experiment: Experiment): PreparedExperiment {
  const where = `data set ${experiment.name}`;
  checkSettings(mechanism, experiment.settings, where);
  for (const p of parameters) {
    const fixedHere = p.kind === "initial" ? p.key in experiment.settings.initial : p.key in experiment.settings.parameters;
    if (fixedHere) throw new SimulationInputError(`${where} sets ${p.name}, which the fit varies: leave it out of the data set or do not vary it`);
  }
  const { time } = experiment;
  time.forEach((t, i) => {
    if (!(t >= 0) || (i > 0 && !(t > time[i - 1]))) throw new SimulationInputError(`${where}: times must start at 0 or later and increase`);
  });
  const points: Point[] = [];
  for (const [species, values] of Object.entries(experiment.series)) {
    const index = mechanism.species.indexOf(species);
    if (index < 0) throw new SimulationInputError(`${where}: "${species}" is not a species of the mechanism`);
    if (values.length !== time.length) throw new SimulationInputError(`${where}: "${species}" needs one value per time`);
    const sd = experiment.sd?.[species];
    if (experiment.sd && !sd) throw new SimulationInputError(`${where}: "${species}" has no standard deviations`);
    values.forEach((measured, i) => {
      if (measured === null) return;
      const weight = sd ? sd[i] : 1;
      if (weight === null || !(weight > 0)) throw new SimulationInputError(`${where}: "${species}" at time ${time[i]} has no positive standard deviation`);
      points.push({ time: i, species: index, measured, weight });
    });
  }
  return { experiment, points };
}

/** The size of the concentrations involved, for a default absolute tolerance. */
function concentrationScale(mechanism: Mechanism, experiments: Experiment[]): number {
  let scale = 0;
  for (const value of Object.values(mechanism.initial)) scale = Math.max(scale, value);
  for (const e of experiments) {
    for (const value of Object.values(e.settings.initial)) scale = Math.max(scale, value);
    for (const values of Object.values(e.series)) for (const value of values) if (value !== null) scale = Math.max(scale, value);
  }
  return scale > 0 ? scale : 1;
}

interface Statistics {
  /** Standard deviation of each ln p. */
  sigma: number[];
  /** Row-major P×P correlation matrix. */
  correlation: number[];
  /** Eigenvalues of the scaled Fisher matrix, ascending, with their eigenvectors. */
  spectrum: { value: number; vector: number[] }[];
  /** Parameters whose column of the Jacobian is zero. */
  insensitive: number[];
}

/**
 * Covariance variance·(JᵀJ)⁻¹ through the eigen-decomposition of JᵀJ scaled to unit diagonal
 * (the scaling makes the condition number speak about the parameters' combinations, not units).
 */
function linearisedStatistics(evaluation: Evaluation, P: number, variance: number): Statistics {
  const { A } = normalEquations(evaluation, P);
  const scale = Array.from({ length: P }, (_, j) => Math.sqrt(A[j * P + j]));
  const insensitive = scale.flatMap((d, j) => (d > 0 ? [] : [j]));
  const scaled = Array.from({ length: P }, (_, a) => Array.from({ length: P }, (_, b) => (scale[a] > 0 && scale[b] > 0 ? A[a * P + b] / (scale[a] * scale[b]) : a === b ? 1 : 0)));
  const { eigenvectors } = eigs(scaled) as unknown as { eigenvectors: { value: number; vector: number[] }[] };
  const spectrum = eigenvectors.map(({ value, vector }) => ({ value, vector: [...vector] })).sort((a, b) => a.value - b.value);
  // (D·R·D)⁻¹ = D⁻¹·V·Λ⁻¹·Vᵀ·D⁻¹, with eigenvalues floored at round-off of the largest: an
  // exactly singular direction then gives huge (not signless) variances and correlations of ±1.
  const floor = ROUND_OFF_EIGENVALUE * spectrum[P - 1].value;
  const inverse = (a: number, b: number) => spectrum.reduce((sum, { value, vector }) => sum + (vector[a] * vector[b]) / Math.max(value, floor), 0);
  const covariance = (a: number, b: number) => (variance * inverse(a, b)) / (scale[a] * scale[b]);
  const sigma = Array.from({ length: P }, (_, j) => (scale[j] > 0 ? Math.sqrt(covariance(j, j)) : Number.POSITIVE_INFINITY));
  const correlation: number[] = [];
  for (let a = 0; a < P; a++) for (let b = 0; b < P; b++) correlation.push(a === b ? 1 : inverse(a, b) / Math.sqrt(inverse(a, a) * inverse(b, b)));
  return { sigma, correlation, spectrum, insensitive };
}

function identifiabilityWarnings(parameters: Parameter[], statistics: Statistics): string[] {
  const P = parameters.length;
  const warnings: string[] = [];
  for (const j of statistics.insensitive) warnings.push(`${parameters[j].name} has no effect on the measured values: these data cannot determine it.`);
  const smallest = statistics.spectrum[0];
  const largest = statistics.spectrum[P - 1];
  if (statistics.insensitive.length === 0 && smallest.value <= SINGULAR_RATIO * largest.value) {
    const involved = parameters.filter((_, j) => Math.abs(smallest.vector[j]) > 0.3).map((p) => p.name);
    const condition = smallest.value > 0 ? (largest.value / smallest.value).toExponential(1) : "infinite";
    warnings.push(
      `The Fisher information matrix is nearly singular (condition number ${condition}): the data do not determine ${involved.length > 1 ? `${involved.join(", ")} separately, only a combination of them` : involved[0]}.`,
    );
  }
  for (let a = 0; a < P; a++) {
    for (let b = a + 1; b < P; b++) {
      const r = statistics.correlation[a * P + b];
      if (Math.abs(r) > HIGH_CORRELATION) {
        warnings.push(`${parameters[a].name} and ${parameters[b].name} are ${r > 0 ? "" : "anti-"}correlated (r = ${r.toFixed(4)}): the data determine a combination of the two much better than either alone.`);
      }
    }
  }
  parameters.forEach((p, j) => {
    const sigma = statistics.sigma[j];
    if (Number.isFinite(sigma) && Z_95 * sigma > Math.log(10)) warnings.push(`${p.name} is poorly determined: its 95 % interval spans more than a factor of 10 either way.`);
  });
  return warnings;
}

function residualReport(mechanism: Mechanism, prepared: PreparedExperiment[], simulated: number[][], residuals: Float64Array): ExperimentResiduals[] {
  let row = 0;
  return prepared.map(({ experiment, points }, e) => {
    const species: ExperimentResiduals["species"] = {};
    points.forEach((point, k) => {
      const name = mechanism.species[point.species];
      (species[name] ??= []).push({ t: experiment.time[point.time], measured: point.measured, simulated: simulated[e][k], residual: residuals[row++] });
    });
    return { experiment: experiment.name, species };
  });
}
