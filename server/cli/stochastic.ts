// `mechweave simulate FILE --stochastic --volume V --runs R --seed S --until T [--samples N]
// [--method direct|next-reaction] [--max-events E] [--set …] [--json]`: an ensemble of exact
// stochastic runs of a mass-action mechanism, on copy numbers n = c·V. Prints the mean and
// variance of every species' copy number on the sample grid and the paths of the first runs.

import type { StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { stochasticSettings } from "~/shared/job-schemas";
import { runJob } from "../sim/job";
import { runModelCommand } from "./simulate";
import { checkedSettings, UsageError } from "./usage";

export function runStochastic(args: string[]): Promise<number> {
  return runModelCommand(
    "simulate",
    args,
    { stochastic: "switch", until: "number", samples: "integer", volume: "number", runs: "integer", seed: "integer", method: "text", "max-events": "integer" },
    (model, flags) => {
      for (const required of ["until", "volume", "runs", "seed"]) {
        if (flags[required] === undefined) throw new UsageError(`--${required} is required with --stochastic`);
      }
      const settings = checkedSettings(
        stochasticSettings,
        { until: flags.until, samples: flags.samples ?? 101, volume: flags.volume, runs: flags.runs, seed: flags.seed, method: flags.method, maxEvents: flags["max-events"] },
        { maxEvents: "max-events" },
      );
      const { t, mean, variance, paths, stats } = runJob({ kind: "stochastic", model, settings });
      return { t, mean, variance, paths, stats };
    },
    (result: StochasticResult) => {
      const names = Object.keys(result.mean);
      const header = ["t", ...names.flatMap((name) => [`mean ${name}`, `sd ${name}`])].join("\t");
      const rows = result.t.map((t, i) => [t, ...names.flatMap((name) => [result.mean[name][i], Math.sqrt(result.variance[name][i])])].map((x) => x.toPrecision(6)).join("\t"));
      const { runs, events, method, volume, ms } = result.stats;
      const summary = `# copy numbers at volume ${volume}; ${runs} runs, ${events} events, ${method === "direct" ? "direct method" : "next reaction method"}, ${ms} ms`;
      return [header, ...rows, summary].join("\n");
    },
  );
}
