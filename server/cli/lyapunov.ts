// `mechweave lyapunov FILE --until T [--transient T0] [--interval τ] [--rtol R --atol A] [--method …] [--json]`
// → { "largest", "converged", "transient", "until", "renormalisations", "history", "stats" }.

import type { LyapunovResult } from "~/chem/kinetics/lyapunov";
import { lyapunovSettings } from "~/shared/job-schemas";
import { runJob } from "../sim/job";
import { runModelCommand } from "./simulate";
import { checkedSettings, UsageError } from "./usage";

export function run(args: string[]): Promise<number> {
  return runModelCommand(
    "lyapunov",
    args,
    { until: "number", transient: "number", interval: "number", rtol: "number", atol: "number", method: "method" },
    (model, flags) => {
      if (flags.until === undefined) throw new UsageError("--until T is required");
      const options = checkedSettings(lyapunovSettings, {
        until: flags.until,
        transient: flags.transient,
        interval: flags.interval,
        rtol: flags.rtol,
        atol: flags.atol,
        method: flags.method,
      });
      return runJob({ kind: "lyapunov", model, options });
    },
    (result: LyapunovResult) =>
      [
        `largest Lyapunov exponent ≈ ${result.largest.toPrecision(4)}${result.converged ? "" : " (not yet converged: run longer)"}`,
        `averaged over t = ${result.transient} … ${result.until}, ${result.renormalisations} renormalisations, ${result.stats.steps} steps, ${result.stats.ms} ms`,
      ].join("\n"),
  );
}
