// The structure report for HTTP callers. Typical mechanisms take milliseconds and are analysed
// in-process; a large text goes to a worker thread, since exact elimination on thousands of
// loosely structured species can take seconds and would stall every other request.
import type { AppLoadContext } from "react-router";
import { analyzeSource, type AnalysisReport } from "~/chem/analysis";

const IN_PROCESS_MAX_LINES = 1_000;

export async function analysisFor(context: AppLoadContext, source: string): Promise<AnalysisReport> {
  let lines = 1;
  for (let i = source.indexOf("\n"); i >= 0 && lines <= IN_PROCESS_MAX_LINES; i = source.indexOf("\n", i + 1)) lines++;
  if (lines <= IN_PROCESS_MAX_LINES) return analyzeSource(source);
  return context.dynamics.run({ kind: "analyze", source });
}
