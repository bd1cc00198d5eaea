// Worker-thread entry: analyses mechanism texts for the rooms, off the server's event loop, and
// returns the analysis-map values ready to compare with what the map holds: the counts as JSON
// text, the report packed.
import { parentPort } from "node:worker_threads";
import { analyzeMechanism, parseForAnalysis } from "../../app/chem/analysis";
import { ShapeMemo } from "../../app/chem/network-shape";
import { IncrementalMechanismParser } from "../../app/chem/parse";
import { analysisEntries, type AnalysisRequest, type AnalysisResponse } from "./analysis-entries";

/**
 * The report depends on the parse alone, and most keystrokes (in a comment, in spacing, in a
 * name being typed back) give a parse seen a moment ago: those are answered from this cache.
 */
const recent = new Map<string, ReturnType<typeof analysisEntries>>();
const RECENT_PARSES = 8;

/** Most requests are the last text with a keystroke more: its unchanged parts are not parsed again. */
const parser = new IncrementalMechanismParser();
/** Most keystrokes change a coefficient, a label or a comment: the network's shape is reused. */
const shapes = new ShapeMemo();

async function entriesFor(source: string) {
  const parsed = parseForAnalysis(source, (text) => parser.parse(text));
  const key = JSON.stringify(parsed);
  let entries = recent.get(key);
  if (entries) recent.delete(key);
  else entries = analysisEntries(await analyzeMechanism(parsed, { shapes }));
  recent.set(key, entries);
  if (recent.size > RECENT_PARSES) recent.delete(recent.keys().next().value!);
  return entries;
}

// Every module is loaded by now: the pool starts the clock of the first analysis.
parentPort?.postMessage("ready");

parentPort?.on("message", async ({ id, source }: AnalysisRequest) => {
  let response: AnalysisResponse;
  try {
    response = { id, ...(await entriesFor(source)) };
  } catch (error) {
    response = { id, failure: (error as Error).stack ?? String(error) };
  }
  parentPort?.postMessage(response);
});
