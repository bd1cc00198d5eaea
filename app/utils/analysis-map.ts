// The room's server-written `analysis` map as clients read it. The full report travels as JSON
// text under `report`: decoding a string is much cheaper for each of a room's clients than Yjs
// decoding a large nested value, and a reader parses it only when it changed.
import type * as Y from "yjs";
import type { AnalysisReport } from "~/chem/analysis";

/** The map's values (empty until the server's first recompute arrives). */
export interface RoomAnalysis {
  deficiency?: number;
  rank?: number;
  /** Counts; the lists themselves are in `report`. */
  linkageClasses?: number;
  species?: number;
  errors?: number;
  revision?: number;
  report?: AnalysisReport;
}

/** A reader of the map that parses the report only when its text changed since the last read. */
export function roomAnalysisReader(): (map: Y.Map<unknown>) => RoomAnalysis {
  let lastText: string | null = null;
  let lastReport: AnalysisReport | undefined;
  return (map) => {
    const { report: text, ...counts } = Object.fromEntries(map.entries()) as Record<string, unknown>;
    if (typeof text !== "string") {
      lastText = null;
      lastReport = undefined;
    } else if (text !== lastText) {
      lastText = text;
      lastReport = JSON.parse(text) as AnalysisReport;
    }
    return { ...(counts as Omit<RoomAnalysis, "report">), report: lastReport };
  };
}
