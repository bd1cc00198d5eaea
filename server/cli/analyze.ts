// `mechweave analyze FILE [--json]`: the structure report of a `.weave` file, as the contract JSON
// or as text. Exit 0 when the file has no errors, 1 when it has (the report still lists them),
// 2 on bad usage.
import { readFile } from "node:fs/promises";
import { analyzeSource } from "~/chem/analysis";
import { formatReport } from "~/chem/report";

const usage = "usage: mechweave analyze FILE [--json]";

export async function run(args: string[]): Promise<number> {
  const flags = args.filter((arg) => arg.startsWith("--"));
  const files = args.filter((arg) => !arg.startsWith("--"));
  const unknown = flags.filter((flag) => flag !== "--json");
  if (unknown.length > 0 || files.length !== 1) {
    const problem = unknown.length > 0 ? `unknown option ${unknown[0]}` : files.length === 0 ? "missing FILE" : "one FILE only";
    process.stderr.write(`mechweave analyze: ${problem}\n${usage}\n`);
    return 2;
  }
  let source: string;
  try {
    source = await readFile(files[0], "utf8");
  } catch {
    process.stderr.write(`mechweave analyze: cannot read ${files[0]}\n`);
    return 2;
  }
  const report = await analyzeSource(source);
  process.stdout.write(flags.includes("--json") ? JSON.stringify(report, null, 2) + "\n" : formatReport(report));
  return report.diagnostics.some((diagnostic) => diagnostic.severity === "error") ? 1 : 0;
}
