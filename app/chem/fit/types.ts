// The contracts of parameter estimation, forward sensitivities and rates of production: what a
// caller asks for (zod schemas, so the CLI, the API and the job worker refuse the same things in
// the same words) and what comes back. The functions live beside this file:
//   sensitivity.ts          computeSensitivities(mechanism, request, options) → SensitivityResult;
//                           rankInfluence(result, species) → parameters by peak |∂ln x/∂ln p|
//   fit.ts                  fitMechanism(mechanism, request, options) → FitResult
//   experiment-csv.ts       readExperimentCsv(text, name, { species }) → { experiment, warnings }
//   rates-of-production.ts  ratesOfProduction(mechanism, network, simulation, species, t) → RatesOfProduction
//
// A parameter is named as `--set` names it: `k1` or `T` (a parameter of the text, used by rate
// coefficients, expressions or custom laws) or `[A]0` (an initial concentration).

import { z } from "zod";
import { integrationSettings, samplesField, untilField } from "~/chem/kinetics/settings";
import { MAX_SAMPLES } from "~/chem/limits";

/** Values set for one run, as the parser's Settings: parameters by name, initial values by species. */
const settingsSchema = z.object({
  parameters: z.record(z.string(), z.number().nonnegative()),
  initial: z.record(z.string(), z.number().nonnegative()),
});

const parameterList = z.array(z.string().min(1)).min(1, "name at least one parameter to vary").max(50, "at most 50 parameters can be varied at once");

/** One measured data set (one CSV): its own settings (initial values, `T`), times, values, optional standard deviations. */
export const experimentSchema = z.object({
  name: z.string().min(1),
  settings: settingsSchema,
  time: z.array(z.number()).min(1),
  /** Per species, one value per time; null where nothing was measured. */
  series: z.record(z.string(), z.array(z.number().nullable())),
  /** Per species, the standard deviation of each value (column `sd(X)`); absent: unweighted. */
  sd: z.record(z.string(), z.array(z.number().positive().nullable())).optional(),
});

export const boundsSchema = z.object({ low: z.number().positive().optional(), high: z.number().positive().optional() });

/** Tolerances of the integrations (the method is always the BDF: sensitivities ride on its corrector). */
const tolerances = integrationSettings.pick({ rtol: true, atol: true });

export const fitRequestSchema = tolerances.extend({
  vary: parameterList,
  experiments: z.array(experimentSchema).min(1, "give at least one data set").max(20, "at most 20 data sets per fit"),
  /** Optional bounds per varied parameter (both ends positive: the search runs in log space). */
  bounds: z.record(z.string(), boundsSchema).optional(),
  maxIterations: z.number().int().min(1).max(1000).optional(),
});

export const sensitivityRequestSchema = tolerances.extend({
  until: untilField,
  samples: samplesField(MAX_SAMPLES),
  /** Default: every named rate coefficient (every parameter of the text a rate coefficient uses). */
  vary: parameterList.optional(),
});

export type Experiment = z.infer<typeof experimentSchema>;
export type FitRequest = z.infer<typeof fitRequestSchema>;
export type SensitivityRequest = z.infer<typeof sensitivityRequestSchema>;

export interface RunOptions {
  signal?: AbortSignal;
}

export interface FitProgress {
  iteration: number;
  /** ½ Σ (weighted residual)² after this iteration. */
  cost: number;
}

export interface FitOptions extends RunOptions {
  onProgress?: (progress: FitProgress) => void;
}

export interface FittedParameter {
  start: number;
  value: number;
  /** Standard error of the value (linearised, by the delta method from the log-space covariance). */
  stderr: number;
  /** 95 % interval exp(ln value ± 1.96·σ_ln): computed in log space, so it is positive and asymmetric. */
  low: number;
  high: number;
  /** The value sits on one of its bounds. */
  atBound: boolean;
}

export interface ResidualPoint {
  t: number;
  measured: number;
  simulated: number;
  /** (simulated − measured) / sd, or simulated − measured when unweighted. */
  residual: number;
}

export interface ExperimentResiduals {
  experiment: string;
  species: Record<string, ResidualPoint[]>;
}

export interface FitResult {
  parameters: Record<string, FittedParameter>;
  /** ½ Σ r² at the optimum (weighted residuals when standard deviations were given). */
  cost: number;
  iterations: number;
  converged: boolean;
  /** Why the search stopped, in words. */
  stopped: string;
  /** correlation[a][b] of the varied parameters (in log space). */
  correlation: Record<string, Record<string, number>>;
  /** Standard deviations were given: no scaling by the residual variance. */
  weighted: boolean;
  points: number;
  residuals: ExperimentResiduals[];
  /** Identifiability and other warnings, in words. */
  warnings: string[];
  ms: number;
}

export interface SensitivityResult {
  t: number[];
  parameters: string[];
  /** Concentrations at the sample times. */
  series: Record<string, number[]>;
  /** ∂ln x/∂ln p per species and parameter; null where x is below the absolute tolerance (the ratio means nothing there). */
  normalized: Record<string, Record<string, (number | null)[]>>;
}

export interface StepContribution {
  /** The directed reaction, e.g. "A + B -> C". */
  reaction: string;
  /** Labels of the steps it comes from (`line N` for an unlabelled step). */
  steps: string[];
  /** The reaction's rate at that time. */
  rate: number;
  /** Net stoichiometric change of the species in this reaction. */
  change: number;
  /** change · rate: this reaction's share of d[X]/dt. */
  contribution: number;
}

export interface RatesOfProduction {
  species: string;
  t: number;
  /** d[X]/dt, the sum of the contributions. */
  total: number;
  /** Ranked by |contribution|, largest first; reactions that do not change the species are left out. */
  contributions: StepContribution[];
}
