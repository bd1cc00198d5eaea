// Every reading of user text for an HTTP caller — the structure report, exports, SBML import, data sets —
// runs here: in a worker thread of the job runner (server/sim), under the analysis time limit, so
// no text can stall the event loop. Exact elimination on a large, loosely structured network can
// take minutes; such a text answers 503 (over the time limit) or 422 (it cannot be analysed).
import type { AppLoadContext } from "react-router";
import type { AnalysisReport } from "~/chem/analysis";
import type { ExportFormat, JobResult, TextJob } from "../../server/sim/job";
import { failureResponse, jobFailure } from "./dynamics.server";

interface Caller {
  request: Request;
  context: AppLoadContext;
  /** `jobOwner(…)`: whose job it is, for the per-user cap. */
  owner: string;
}

async function runTextJob<J extends TextJob>({ request, context, owner }: Caller, job: J): Promise<JobResult<J>> {
  try {
    return await context.dynamics.run(job, { signal: request.signal, owner });
  } catch (error) {
    const failure = jobFailure(error);
    if (failure) throw failureResponse(failure);
    // Anything else went wrong inside the analysis of this text (an exact result too large to
    // represent, a solver that refused the problem): the text's doing, not a server fault.
    throw failureResponse({ code: "analysis_failed", message: `This text could not be analysed: ${(error as Error).message}` });
  }
}

export function analysisFor(caller: Caller, source: string): Promise<AnalysisReport> {
  return runTextJob(caller, { kind: "analyze", source });
}

export function exportFor(caller: Caller, source: string, format: ExportFormat, title: string) {
  return runTextJob(caller, { kind: "export", source, format, title });
}

export function sbmlImportFor(caller: Caller, xml: string) {
  return runTextJob(caller, { kind: "import", xml });
}

/** An uploaded CSV read as a fit reads its data sets: columns and rows, or why it cannot be read. */
export function dataSetCheckFor(caller: Caller, csv: string) {
  return runTextJob(caller, { kind: "readData", csv });
}
