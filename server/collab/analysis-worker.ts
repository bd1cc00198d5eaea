// Worker-thread entry: analyses mechanism texts for the rooms, off the server's event loop, and
// returns each analysis-map value already serialised (so the room compares strings, not trees).
import { parentPort } from "node:worker_threads";
import { analyzeSource } from "../../app/chem/analysis";
import { analysisEntries, type AnalysisRequest, type AnalysisResponse } from "./analysis-entries";

parentPort?.on("message", async ({ id, source }: AnalysisRequest) => {
  let response: AnalysisResponse;
  try {
    const report = await analyzeSource(source);
    response = { id, ...analysisEntries(report) };
  } catch (error) {
    response = { id, failure: (error as Error).stack ?? String(error) };
  }
  parentPort?.postMessage(response);
});
