// A dynamics job as plain data (it crosses into a worker thread by structured clone) and the one
// function that carries it out. The CLI runs jobs in-process; the server runs them in a worker.
// The realization of an ODE (its MILP searches can run for seconds) and the structure analysis of
// a large text travel the same way.

import { networkEquilibrium, polynomialEquilibrium, type EquilibriumOptions, type EquilibriumResult } from "~/chem/kinetics/equilibrium";
import { SimulationInputError } from "~/chem/kinetics/errors";
import { networkLyapunov, polynomialLyapunov, type LyapunovOptions, type LyapunovResult } from "~/chem/kinetics/lyapunov";
import type { SimulationSettings } from "~/chem/kinetics/settings";
import { simulateNetwork, simulatePolynomialOde, type SimulationResult } from "~/chem/kinetics/simulate";
import { sweepNetwork, type SweepOptions, type SweepResult } from "~/chem/kinetics/sweep";
import { analyzeSource, type AnalysisReport } from "~/chem/analysis";
import type { Mechanism, Network, PolynomialOde } from "~/chem/model";
import { realizeOde, type RealizeOdeRequest, type RealizeOdeResult } from "~/chem/realize/realize-ode";

export type DynamicsModel = { kind: "mechanism"; mechanism: Mechanism; network: Network } | { kind: "ode"; ode: PolynomialOde };

type Plain<T> = Omit<T, "signal" | "onProgress">;

export type DynamicsJob =
  | { kind: "simulate"; model: DynamicsModel; settings: SimulationSettings }
  | { kind: "lyapunov"; model: DynamicsModel; options: Plain<LyapunovOptions> }
  | { kind: "equilibrium"; model: DynamicsModel; options: EquilibriumOptions }
  | { kind: "sweep"; model: DynamicsModel; options: Plain<SweepOptions> };

/** A realization request with a time limit for its searches instead of a progress callback. */
export type RealizationJob = {
  kind: "realize";
  request: Omit<RealizeOdeRequest, "equivalents"> & { equivalents?: { timeLimitMs: number } };
};

export type AnalysisJob = { kind: "analyze"; source: string };

export type WorkerJob = DynamicsJob | RealizationJob | AnalysisJob;

export interface DynamicsResults {
  simulate: SimulationResult;
  lyapunov: LyapunovResult;
  equilibrium: EquilibriumResult;
  sweep: SweepResult;
  realize: RealizeOdeResult;
  analyze: AnalysisReport;
}

export type JobResult<J extends WorkerJob> = DynamicsResults[J["kind"]];

export interface JobHooks {
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

/** Progress is the share of source complexes searched, stage by stage (sparse, dense, weakly reversible). */
export function runRealizationJob({ request }: RealizationJob, hooks: JobHooks = {}): Promise<RealizeOdeResult> {
  const stages = 3;
  let stage = -1;
  let name = "";
  return realizeOde({
    ...request,
    equivalents: request.equivalents && {
      ...request.equivalents,
      onProgress(progress) {
        if (progress.stage !== name) [name, stage] = [progress.stage, stage + 1];
        hooks.onProgress?.((stage + (progress.total ? progress.done / progress.total : 0)) / stages);
      },
    },
  });
}

export function runAnalysisJob({ source }: AnalysisJob): Promise<AnalysisReport> {
  return analyzeSource(source);
}

export function runJob<J extends DynamicsJob>(job: J, hooks: JobHooks = {}): JobResult<J> {
  return dispatch(job, hooks) as JobResult<J>;
}

function dispatch(job: DynamicsJob, hooks: JobHooks): DynamicsResults[keyof DynamicsResults] {
  const { model } = job;
  switch (job.kind) {
    case "simulate": {
      const options = { ...job.settings, ...hooks };
      return model.kind === "ode" ? simulatePolynomialOde(model.ode, options) : simulateNetwork(model.mechanism, model.network, options);
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
  }
}

/** Variables and reactions of a model: what its cost grows with. */
export function modelSize(model: DynamicsModel): { variables: number; reactions: number } {
  return model.kind === "ode"
    ? { variables: model.ode.variables.length, reactions: model.ode.rhs.reduce((sum, terms) => sum + terms.length, 0) }
    : { variables: model.network.species.length, reactions: model.network.reactions.length };
}
