// `mechweave lyapunov FILE --until T [--transient T0] [--interval τ] [--rtol R --atol A] [--method …] [--json]`
// → { "largest", "converged", "transient", "until", "renormalisations", "history", "stats" }.

import type { LyapunovResult } from "~/chem/kinetics/lyapunov";
import { runJob } from "../sim/job";
import { runModelCommand, UsageError } from "./simulate";

export function run(args: string[]): Promise<number> {
  return runModelCommand(
    "lyapunov",
    args,
    { until: "number", transient: "number", interval: "number", rtol: "number", atol: "number", method: "method" },
    (model, flags) => {
      if (flags.until === undefined) throw new UsageError("--until T is required");
      const options = {
        until: flags.until as number,
        transient: flags.transient as number | undefined,
        interval: flags.interval as number | undefined,
        rtol: flags.rtol as number | undefined,
        atol: flags.atol as number | undefined,
        method: flags.method as "auto" | "stiff" | "explicit" | undefined,
      };
      return runJob({ kind: "lyapunov", model, options });
    },
    (result: LyapunovResult) =>
      [
        `largest Lyapunov exponent ≈ ${result.largest.toPrecision(4)}${result.converged ? "" : " (not yet converged: run longer)"}`,
        `averaged over t = ${result.transient} … ${result.until}, ${result.renormalisations} renormalisations, ${result.stats.steps} steps, ${result.stats.ms} ms`,
      ].join("\n"),
  );
}
