// `mechweave sensitivity FILE --until T [--samples N] [--vary k1,k2] [--set …] [--rtol R --atol A] [--json]`
// → { "t": [...], "normalized": { "SPECIES": { "PARAM": [...] } } }: ∂ln x/∂ln p over time
// (null where x is below the absolute tolerance); by default for every named rate coefficient.

import { computeSensitivities } from "~/chem/fit/sensitivity";
import { sensitivityRequestSchema, type SensitivityResult } from "~/chem/fit/types";
import { mechanismOf, varied } from "./fit";
import { runModelCommand } from "./simulate";
import { checkedSettings, UsageError } from "./usage";

type SensitivityOutput = Pick<SensitivityResult, "t" | "normalized">;

export function run(args: string[]): Promise<number> {
  return runModelCommand(
    "sensitivity",
    args,
    { until: "number", samples: "integer", vary: "texts", rtol: "number", atol: "number" },
    (model, flags): SensitivityOutput => {
      const mechanism = mechanismOf(model, "sensitivity");
      if (flags.until === undefined) throw new UsageError("--until T is required");
      const request = checkedSettings(sensitivityRequestSchema, {
        until: flags.until,
        samples: flags.samples ?? 101,
        vary: varied(flags),
        rtol: flags.rtol,
        atol: flags.atol,
      });
      const { t, normalized } = computeSensitivities(mechanism, request);
      return { t, normalized };
    },
    (result: SensitivityOutput) => {
      const columns = Object.entries(result.normalized).flatMap(([species, byParameter]) => Object.keys(byParameter).map((p) => ({ species, p, values: byParameter[p] })));
      const header = ["t", ...columns.map((c) => `${c.species}/${c.p}`)].join("\t");
      const rows = result.t.map((t, i) => [t.toPrecision(6), ...columns.map((c) => c.values[i]?.toPrecision(4) ?? "-")].join("\t"));
      return [header, ...rows].join("\n");
    },
  );
}
