// A dynamics job as plain data (it crosses into a worker thread by structured clone) and the one
// function that carries it out. The CLI runs jobs in-process; the server runs them in a worker.
// The realization of an ODE (its MILP searches can run for seconds) and every analysis of user
// text (the structure report, exports, SBML import, parsing a text for a run) travel the same way:
// none of them may stall the server's event loop.

import type { FitProgress } from "~/chem/fit/types";
import { sweepBifurcations, type BifurcationSweepResult } from "~/chem/kinetics/bifurcation-sweep";
import { continueEquilibria, type ContinuationResult } from "~/chem/kinetics/continuation";
import { networkEquilibrium, polynomialEquilibrium, type EquilibriumResult } from "~/chem/kinetics/equilibrium";
import { SimulationInputError } from "~/chem/kinetics/errors";
import { networkLyapunov, polynomialLyapunov, type LyapunovResult } from "~/chem/kinetics/lyapunov";
import { simulateNetwork, simulatePolynomialOde, type SimulationResult } from "~/chem/kinetics/simulate";
import { simulateEnsemble, summarizeTally, type EnsembleTally, type StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { MAX_SWEEP_POINTS } from "~/chem/limits";
import { sweepNetwork, type SweepResult } from "~/chem/kinetics/sweep";
import { analyzeSource, type AnalysisReport } from "~/chem/analysis";
import { csvTooLarge, stoichiometricMatrixCsv } from "~/chem/exchange/csv";
import { exportLatex } from "~/chem/exchange/latex";
import { exportSbml } from "~/chem/exchange/sbml-export";
import { importSbml, type SbmlImport } from "~/chem/exchange/sbml-import";
import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { buildNetwork } from "~/chem/network";
import { parseOde } from "~/chem/ode/parse";
import { parseMechanism, parseMechanismWithSettings } from "~/chem/parse";
import { realizeOde, type RealizeOdeResult } from "~/chem/realize/realize-ode";
import { RealizeRequestError } from "~/chem/realize/request-error";
import {
  continuationSettings,
  equilibriumSettings,
  fitSettings,
  lyapunovSettings,
  sensitivitySettings,
  overrides,
  realizeRequest,
  simulateSettings,
  stochasticSettings,
  sweepSettings,
  witnessSettings,
  type ContinuationSettings,
  type EquilibriumSettings,
  type FitSettings,
  type LyapunovSettings,
  type SensitivitySettings,
  type Overrides,
  type RealizeRequest,
  type SimulateSettings,
  type StochasticSettings,
  type SweepSettings,
  type WitnessSettings,
} from "~/shared/job-schemas";
import { searchWitness, type WitnessSearchResult } from "~/chem/witness-search";
import { firstProblem } from "~/shared/fields";
import type { ZodType } from "zod";
import type { SensitivityResult } from "~/chem/fit/types";
import { checkDataSet, runFit, runSensitivity, type DataCheck } from "./fit-job";

/**
 * `text` and `odeText` are a mechanism and a polynomial ODE not yet parsed: the worker parses them,
 * so no text (a long one, or powers of sums that expand to thousands of terms) stalls the server.
 */
export type DynamicsModel =
  | { kind: "mechanism"; mechanism: Mechanism; network: Network }
  | { kind: "ode"; ode: PolynomialOde }
  | { kind: "text"; source: string; overrides?: Overrides }
  | { kind: "odeText"; text: string };

type ParsedModel = Exclude<DynamicsModel, { kind: "text" | "odeText" }>;

export type DynamicsJob =
  | { kind: "simulate"; model: DynamicsModel; settings: SimulateSettings }
  | { kind: "lyapunov"; model: DynamicsModel; options: LyapunovSettings }
  | { kind: "equilibrium"; model: DynamicsModel; options: EquilibriumSettings }
  | { kind: "sweep"; model: DynamicsModel; options: SweepSettings }
  | { kind: "stochastic"; model: DynamicsModel; settings: StochasticSettings }
  /** Runs `first` … `first + runs − 1` of a stochastic ensemble, as sums to merge: the queue splits an ensemble into these. */
  | { kind: "stochasticRange"; model: DynamicsModel; settings: StochasticSettings; first: number; runs: number }
  | { kind: "continuation"; model: DynamicsModel; options: ContinuationSettings }
  | { kind: "fit"; model: DynamicsModel; options: FitSettings }
  | { kind: "sensitivity"; model: DynamicsModel; options: SensitivitySettings }
  /** The multistationarity witness search with a longer budget than the analysis on every change. */
  | { kind: "witness"; model: DynamicsModel; options: WitnessSettings };

/** A realization request, with the time its searches for equivalents may take together. */
export type RealizationJob = { kind: "realize"; request: RealizeRequest; timeLimitMs: number };

export type AnalysisJob = { kind: "analyze"; source: string };

export type ExportFormat = "sbml" | "latex" | "csv";
export type ExportJob = { kind: "export"; source: string; format: ExportFormat; title: string };
/** The file's text, or why it cannot be written (`tooLarge`: the input is fine but the file would be huge). */
export type ExportResult = { body: string } | { refusal: string; tooLarge: boolean };

export type ImportJob = { kind: "import"; xml: string };

/** An uploaded data set read as a fit will read it, to refuse a malformed one before it is stored. */
export type DataCheckJob = { kind: "readData"; csv: string };

/** Jobs that read user text and answer within the analysis time limit. */
export type TextJob = AnalysisJob | ExportJob | ImportJob | DataCheckJob;

export type WorkerJob = DynamicsJob | RealizationJob | TextJob;

export const isTextJob = (job: WorkerJob): job is TextJob => job.kind === "analyze" || job.kind === "export" || job.kind === "import" || job.kind === "readData";

export interface DynamicsResults {
  simulate: SimulationResult;
  lyapunov: LyapunovResult;
  equilibrium: EquilibriumResult;
  sweep: SweepResult;
  stochastic: StochasticResult;
  stochasticRange: EnsembleTally;
  /** One branch, or with a second parameter the fold and Hopf points of one branch per value. */
  continuation: ContinuationResult | BifurcationSweepResult;
  fit: ReturnType<typeof runFit>;
  sensitivity: SensitivityResult;
  /** A promise: the search's LP solver loads asynchronously (the worker awaits every result). */
  witness: Promise<WitnessSearchResult>;
  realize: RealizeOdeResult;
  analyze: AnalysisReport;
  export: ExportResult;
  import: SbmlImport;
  readData: DataCheck;
}

export type JobResult<J extends WorkerJob> = DynamicsResults[J["kind"]];

export interface JobHooks {
  /** `note`: what a fit's bar shows instead of a share (its iterations and cost). */
  onProgress?: (fraction: number, note?: FitProgress) => void;
  signal?: AbortSignal;
}

/** Progress is the share of source complexes searched, stage by stage (sparse, dense, weakly reversible). */
export function runRealizationJob({ request, timeLimitMs }: RealizationJob, hooks: JobHooks = {}): Promise<RealizeOdeResult> {
  // The job crossed into a worker as untyped data: the API's own schema checks it again here.
  const checked = realizeRequest.safeParse(request);
  if (!checked.success) throw new RealizeRequestError(firstProblem(checked.error));
  const stages = 3;
  let stage = -1;
  let name = "";
  return realizeOde({
    ...checked.data,
    equivalents: checked.data.equivalents && {
      timeLimitMs,
      onProgress(progress) {
        if (progress.stage !== name) [name, stage] = [progress.stage, stage + 1];
        hooks.onProgress?.((stage + (progress.total ? progress.done / progress.total : 0)) / stages);
      },
    },
  });
}

export async function runTextJob(job: TextJob): Promise<AnalysisReport | ExportResult | SbmlImport | DataCheck> {
  if (job.kind === "analyze") return analyzeSource(job.source);
  if (job.kind === "readData") return checkDataSet(job.csv);
  if (job.kind === "import") return importSbml(job.xml);
  return exportText(job);
}

async function exportText({ source, format, title }: ExportJob): Promise<ExportResult> {
  const parsed = parseMechanism(source);
  const error = parsed.diagnostics.find((d) => d.severity === "error");
  if (error) return { refusal: `Fix the mechanism before exporting it: line ${error.line}: ${error.message}`, tooLarge: false };
  if (format === "sbml") return { body: exportSbml(parsed.mechanism, { title }) };
  const report = await analyzeSource(source);
  if (format === "latex") return { body: exportLatex(parsed.mechanism, report, { title }) };
  const refusal = csvTooLarge(report);
  return refusal ? { refusal, tooLarge: true } : { body: stoichiometricMatrixCsv(report) };
}

/** The limits a dynamics job is checked against before it runs. */
export interface SizeLimits {
  maxVariables: number;
  maxReactions: number;
  maxSamples: number;
  maxSweepPoints: number;
}

/** A job is bigger, longer or hungrier than this server runs; `limit` says which. */
export class SimulationLimitError extends Error {
  override name = "SimulationLimitError";
  /** A run stopped by its time limit met the server's limit; anything else is too large an input. */
  get code(): "time_limit" | "too_large" {
    return this.limit === "time" ? "time_limit" : "too_large";
  }
  constructor(
    message: string,
    readonly limit: "size" | "time" | "memory",
  ) {
    super(message);
  }
}

/** Each kind's schema; a job keeps what it checks in `settings` (runs) or `options` (the rest). */
const settingsSchemas: Record<DynamicsJob["kind"], ZodType> = {
  simulate: simulateSettings,
  stochastic: stochasticSettings,
  stochasticRange: stochasticSettings,
  equilibrium: equilibriumSettings,
  lyapunov: lyapunovSettings,
  sweep: sweepSettings,
  continuation: continuationSettings,
  fit: fitSettings,
  sensitivity: sensitivitySettings,
  witness: witnessSettings,
};

/** The job's settings checked by its kind's schema: the CLI and the API checked them already, but a job in a worker arrived as untyped data. */
function checkSettings(job: DynamicsJob): void {
  const checked = settingsSchemas[job.kind].safeParse("settings" in job ? job.settings : job.options);
  if (!checked.success) throw new SimulationInputError(firstProblem(checked.error));
  if (job.kind === "stochasticRange") {
    const { first, runs } = job;
    const inside = Number.isInteger(first) && Number.isInteger(runs) && first >= 0 && runs >= 1 && first + runs <= job.settings.runs;
    if (!inside) throw new SimulationInputError("the range of runs lies outside the ensemble");
  }
  if (job.model.kind === "text" && job.model.overrides) {
    const checkedOverrides = overrides.safeParse(job.model.overrides);
    if (!checkedOverrides.success) throw new SimulationInputError(`overrides: ${firstProblem(checkedOverrides.error)}`);
  }
}

export function runJob<J extends DynamicsJob>(job: J, hooks: JobHooks = {}, limits?: SizeLimits): JobResult<J> {
  checkSettings(job);
  const model = parsedModel(job.model);
  if (limits) checkSize(job, model, limits);
  return dispatch(job, model, hooks) as JobResult<J>;
}

/** The text as a model, or a SimulationInputError naming the first error in it. */
function parsedModel(model: DynamicsModel): ParsedModel {
  if (model.kind === "odeText") {
    const parsed = parseOde(model.text);
    const error = parsed.diagnostics.find((d) => d.severity === "error");
    if (error || !parsed.ode) throw new SimulationInputError(`Fix the ODE first: line ${error?.line ?? 1}: ${error?.message ?? "it has no equations"}`);
    return { kind: "ode", ode: parsed.ode };
  }
  if (model.kind !== "text") return model;
  const parsed = model.overrides ? parseMechanismWithSettings(model.source, model.overrides) : { ...parseMechanism(model.source), unknown: [] };
  if (parsed.unknown.length > 0) throw new SimulationInputError(`The override ${parsed.unknown[0]} names no parameter or species of the mechanism`);
  const error = parsed.diagnostics.find((d) => d.severity === "error");
  if (error) throw new SimulationInputError(`Fix the mechanism first: line ${error.line}, column ${error.column}: ${error.message}`);
  return { kind: "mechanism", mechanism: parsed.mechanism, network: buildNetwork(parsed.mechanism) };
}

function checkSize(job: DynamicsJob, model: ParsedModel, limits: SizeLimits): void {
  const { variables, reactions } = modelSize(model);
  if (variables > limits.maxVariables) throw new SimulationLimitError(`the model has ${variables} variables; at most ${limits.maxVariables} can be simulated here`, "size");
  if (reactions > limits.maxReactions) throw new SimulationLimitError(`the model has ${reactions} reactions; at most ${limits.maxReactions} can be simulated here`, "size");
  const samples = job.kind === "sweep" || job.kind === "sensitivity" ? job.options.samples : "settings" in job ? job.settings.samples : 0;
  if (samples > limits.maxSamples) throw new SimulationLimitError(`at most ${limits.maxSamples} samples per run`, "size");
  const points = job.kind === "sweep" ? job.options.points : 0;
  if (points > Math.min(limits.maxSweepPoints, MAX_SWEEP_POINTS)) throw new SimulationLimitError(`at most ${Math.min(limits.maxSweepPoints, MAX_SWEEP_POINTS)} sweep points`, "size");
}

function dispatch(job: DynamicsJob, model: ParsedModel, hooks: JobHooks): DynamicsResults[keyof DynamicsResults] {
  switch (job.kind) {
    case "simulate": {
      const options = { ...job.settings, ...hooks };
      return model.kind === "ode" ? simulatePolynomialOde(model.ode, options) : simulateNetwork(model.mechanism, model.network, options);
    }
    case "stochastic":
    case "stochasticRange": {
      if (model.kind === "ode") throw new SimulationInputError("stochastic runs need a mechanism: a polynomial ODE has no reaction events");
      const { first, runs } = job.kind === "stochasticRange" ? job : { first: 0, runs: job.settings.runs };
      const tally = simulateEnsemble(model.mechanism, model.network, { ...job.settings, first, runs, onProgress: hooks.onProgress });
      return job.kind === "stochastic" ? summarizeTally(tally, job.settings.volume) : tally;
    }
    case "lyapunov": {
      const options = { ...job.options, ...hooks };
      return model.kind === "ode" ? polynomialLyapunov(model.ode, options) : networkLyapunov(model.mechanism, model.network, options);
    }
    case "equilibrium":
      return model.kind === "ode" ? polynomialEquilibrium(model.ode, job.options) : networkEquilibrium(model.mechanism, model.network, job.options);
    case "sweep":
      if (model.kind === "ode") throw new SimulationInputError("sweeps vary a mechanism's rate coefficients or initial concentrations");
      return sweepNetwork(model.mechanism, model.network, { ...job.options, ...hooks });
    case "continuation":
      if (model.kind === "ode") throw new SimulationInputError("a continuation varies a mechanism's parameters, held species, step coefficients or initial amounts");
      return job.options.second
        ? sweepBifurcations(model.mechanism, { ...job.options, second: job.options.second, ...hooks })
        : continueEquilibria(model.mechanism, { ...job.options, ...hooks });
    case "fit":
      if (model.kind === "ode") throw new SimulationInputError("fits vary a mechanism's rate coefficients or initial concentrations");
      return runFit(model.mechanism, job.options, hooks);
    case "sensitivity":
      if (model.kind === "ode") throw new SimulationInputError("sensitivities are computed for a mechanism's parameters");
      return runSensitivity(model.mechanism, job.options, hooks);
    case "witness":
      if (model.kind === "ode") throw new SimulationInputError("a witness search needs a mechanism: its verdict rests on the reaction network");
      return searchWitness(model.mechanism, { budgetMs: job.options.budgetMs, onProgress: hooks.onProgress });
  }
}

/** Variables and reactions of a model: what its cost grows with. */
function modelSize(model: ParsedModel): { variables: number; reactions: number } {
  return model.kind === "ode"
    ? { variables: model.ode.variables.length, reactions: model.ode.rhs.reduce((sum, terms) => sum + terms.length, 0) }
    : { variables: model.network.species.length, reactions: model.network.reactions.length };
}
