// `mechweave analyze FILE [--set NAME=VALUE …] [--json]`: the structure report of a `.weave` file,
// as the contract JSON or as text. Exit 0 when the file has no errors, 1 when it has (the report
// still lists them), 2 on bad usage.
import { analyzeMechanism, parseForAnalysis } from "~/chem/analysis";
import { MAX_WITNESS_SEARCH_MS } from "~/chem/limits";
import type { Settings } from "~/chem/parse";
import { formatReport } from "~/chem/report";
import { parseWithSettings, readCommandLine, readSource, SETTINGS_FLAG } from "./command-line";
import { UsageError } from "./usage";

const usage = "usage: mechweave analyze FILE [--set NAME=VALUE …] [--json]";

export async function run(args: string[]): Promise<number> {
  let report;
  let json: boolean;
  try {
    const { file, flags } = readCommandLine(args, { json: "switch", ...SETTINGS_FLAG });
    json = flags.json === true;
    const source = await readSource(file);
    // A rate coefficient set to 0 leaves the network here exactly as if the file said so.
    const parsed = parseForAnalysis(source, (text) => parseWithSettings(text, file, flags.set as Settings | undefined));
    // Only the caller waits here, so the multistationarity witness is searched for (rooms skip it).
    report = await analyzeMechanism(parsed, { witnessSearchMs: MAX_WITNESS_SEARCH_MS });
  } catch (error) {
    if (!(error instanceof UsageError)) throw error;
    process.stderr.write(`mechweave analyze: ${error.message}\n${usage}\n`);
    return 2;
  }
  process.stdout.write(json ? JSON.stringify(report, null, 2) + "\n" : formatReport(report));
  return report.diagnostics.some((diagnostic) => diagnostic.severity === "error") ? 1 : 0;
}
