// `mechweave fit FILE --data DATA.csv [--data MORE.csv …] --vary k1,k2 [--set …] [--rtol R --atol A] [--json]`
// → { "parameters": { "k1": { "value", "stderr", "low", "high" } }, "cost", "iterations",
// "converged", "correlation", "warnings" }. Each CSV is one experiment (app/chem/fit/experiment-csv.ts).
// A data file that cannot be read is bad usage (exit 2); one that cannot be used is an input error (exit 1).

import { CsvError } from "~/chem/kinetics/csv";
import { SimulationInputError } from "~/chem/kinetics/errors";
import { readExperimentCsv } from "~/chem/fit/experiment-csv";
import { fitMechanism } from "~/chem/fit/fit";
import type { FitResult } from "~/chem/fit/types";
import type { Mechanism } from "~/chem/model";
import type { DynamicsModel } from "../sim/job";
import { readSource, type FlagValue } from "./command-line";
import { runModelCommand } from "./simulate";
import { UsageError } from "./usage";

type FitOutput = Pick<FitResult, "cost" | "iterations" | "converged" | "correlation" | "warnings"> & {
  parameters: Record<string, { value: number; stderr: number; low: number; high: number }>;
};

/** The mechanism of a .weave model; the fitting commands need named parameters, which a .ode file has not. */
export function mechanismOf(model: DynamicsModel, command: string): Mechanism {
  if (model.kind !== "mechanism") throw new UsageError(`${command} works on .weave mechanisms`);
  return model.mechanism;
}

/** `--vary k1,k2 --vary "[A]0"`: every name, in order. */
export function varied(flags: Record<string, FlagValue>): string[] | undefined {
  const lists = flags.vary as string[] | undefined;
  return lists?.flatMap((list) => list.split(",")).map((name) => name.trim()).filter((name) => name !== "");
}

export function run(args: string[]): Promise<number> {
  return runModelCommand(
    "fit",
    args,
    { data: "texts", vary: "texts", rtol: "number", atol: "number", "max-iterations": "integer" },
    async (model, flags): Promise<FitOutput> => {
      const mechanism = mechanismOf(model, "fit");
      const files = (flags.data as string[] | undefined) ?? [];
      if (files.length === 0) throw new UsageError("--data DATA.csv is required (repeat it for more data sets)");
      const vary = varied(flags);
      if (!vary?.length) throw new UsageError("--vary k1,k2,… is required");
      const experiments = [];
      for (const file of files) {
        const text = await readSource(file);
        try {
          const { experiment, warnings } = readExperimentCsv(text, file, { species: mechanism.species });
          for (const warning of warnings) process.stderr.write(`${file}: warning: ${warning}\n`);
          experiments.push(experiment);
        } catch (error) {
          if (error instanceof CsvError) throw new SimulationInputError(`${file}: ${error.message}`);
          throw error;
        }
      }
      const result = fitMechanism(mechanism, {
        vary,
        experiments,
        rtol: flags.rtol as number | undefined,
        atol: flags.atol as number | undefined,
        maxIterations: flags["max-iterations"] as number | undefined,
      });
      const parameters = Object.fromEntries(Object.entries(result.parameters).map(([name, p]) => [name, { value: p.value, stderr: p.stderr, low: p.low, high: p.high }]));
      return { parameters, cost: result.cost, iterations: result.iterations, converged: result.converged, correlation: result.correlation, warnings: result.warnings };
    },
    (result: FitOutput) => {
      const names = Object.keys(result.parameters);
      const rows = names.map((name) => {
        const { value, stderr, low, high } = result.parameters[name];
        return [name, value, stderr, low, high].map((x) => (typeof x === "number" ? x.toPrecision(5) : x)).join("\t");
      });
      const correlation = names.map((a) => [a, ...names.map((b) => result.correlation[a][b].toFixed(3))].join("\t"));
      const status = `# cost ${result.cost.toPrecision(6)}, ${result.iterations} iterations, ${result.converged ? "converged" : "not converged"}`;
      return [["parameter", "value", "stderr", "low95", "high95"].join("\t"), ...rows, "", ["correlation", ...names].join("\t"), ...correlation, status, ...result.warnings.map((w) => `# ${w}`)].join("\n");
    },
  );
}
