// The estimation jobs — fit and sensitivity on a parsed mechanism, and reading an upload —: the data sets' CSV texts
// are read here, in the worker (a 5 MiB upload must not stall the server), against the model's
// species, and the numerics of app/chem/fit do the rest.
import { computeSensitivities } from "~/chem/fit/sensitivity";
import { fitMechanism } from "~/chem/fit/fit";
import { readExperimentCsv } from "~/chem/fit/experiment-csv";
import type { FitResult, SensitivityResult } from "~/chem/fit/types";
import { SimulationInputError } from "~/chem/kinetics/errors";
import type { Mechanism } from "~/chem/model";
import type { FitSettings, SensitivitySettings } from "~/shared/job-schemas";
import type { JobHooks } from "./job";

/** Iterations a fit may take on the shared server; progress is counted against them. */
export const SERVER_FIT_ITERATIONS = 200;

export function runFit(mechanism: Mechanism, settings: FitSettings, hooks: JobHooks): FitResult & { dataWarnings: string[] } {
  const dataWarnings: string[] = [];
  const experiments = settings.data.map(({ name, csv }) => {
    try {
      const { experiment, warnings } = readExperimentCsv(csv, name, { species: mechanism.species });
      dataWarnings.push(...warnings.map((warning) => `${name}: ${warning}`));
      return experiment;
    } catch (error) {
      throw new SimulationInputError(`data set ${name}: ${(error as Error).message}`);
    }
  });
  const result = fitMechanism(
    mechanism,
    { vary: settings.vary, bounds: settings.bounds, experiments, maxIterations: SERVER_FIT_ITERATIONS },
    { signal: hooks.signal, onProgress: (progress) => hooks.onProgress?.(Math.min(0.99, progress.iteration / SERVER_FIT_ITERATIONS), progress) },
  );
  return { ...result, dataWarnings };
}

export function runSensitivity(mechanism: Mechanism, settings: SensitivitySettings, hooks: JobHooks): SensitivityResult {
  return computeSensitivities(mechanism, settings, { signal: hooks.signal });
}

/** What an upload holds (columns besides time, rows), or why it cannot be read as a data set. */
export type DataCheck = { columns: string[]; rows: number; warnings: string[] } | { refusal: string };

export function checkDataSet(csv: string): DataCheck {
  try {
    const { experiment, warnings } = readExperimentCsv(csv, "upload", {});
    return { columns: Object.keys(experiment.series), rows: experiment.time.length, warnings };
  } catch (error) {
    if (error instanceof Error && error.name === "CsvError") return { refusal: error.message };
    throw error;
  }
}
