// The room's server-written `analysis` map as clients read it. The full report travels under
// `report` as raw-deflated JSON (packed by the server, server/collab/analysis-entries.ts): a fifth of the bytes of its text (14 KB instead of 58 KB for a
// 200-step mechanism), sent to every member on every structural change, and still far cheaper for
// a client to read than Yjs decoding a large nested value. A reader unpacks it only when it changed.
import { inflateSync, strFromU8 } from "fflate";
import type * as Y from "yjs";
import type { AnalysisReport } from "~/chem/analysis";

/** The map's keys besides the counts, which the server reads back and rewrites. */
export const analysisFields = {
  /** The packed report. */
  report: "report",
  /** A digest of the text analysed: the stored analysis belongs to the text when it matches. */
  digest: "digest",
  /** Grows with every recompute, across reloads. */
  revision: "revision",
  /** Why the current text has no analysis. */
  failure: "failure",
} as const;

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
  /** Why the current text has no analysis (it ran over the time limit, say); absent once one succeeds. */
  failure?: string;
}

export function unpackReport(packed: Uint8Array): AnalysisReport {
  return JSON.parse(strFromU8(inflateSync(packed))) as AnalysisReport;
}

/**
 * Unpacks with the platform's own inflate where there is one (every browser, Node): at 500 steps
 * fflate's inflate on the page's thread cost a few milliseconds of every keystroke's report. The
 * bytes reach it as a response body, not a Blob, whose registration with the browser process cost
 * about 2 ms of the page's thread per 40 KB report.
 */
export async function unpackReportNatively(packed: Uint8Array): Promise<AnalysisReport> {
  if (typeof DecompressionStream === "undefined") return unpackReport(packed);
  const inflated = new Response(packed as Uint8Array<ArrayBuffer>).body!.pipeThrough(new DecompressionStream("deflate-raw"));
  return JSON.parse(await new Response(inflated).text()) as AnalysisReport;
}

/**
 * Calls `onRead` with the map's values now and after every change, each time the report is
 * unpacked (only when it changed, by the platform's inflate). Counts and report always arrive
 * together, and a read overtaken by a newer change is dropped. Returns the unsubscribe.
 */
export function watchRoomAnalysis(map: Y.Map<unknown>, onRead: (analysis: RoomAnalysis) => void): () => void {
  let lastPacked: Uint8Array | null = null;
  let lastReport: AnalysisReport | undefined;
  let newest = 0;
  const read = () => {
    const ticket = ++newest;
    const { packed, counts } = mapValues(map);
    if (!(packed instanceof Uint8Array)) {
      [lastPacked, lastReport] = [null, undefined];
      return onRead(counts);
    }
    if (packed === lastPacked) return onRead({ ...counts, report: lastReport });
    const settle = (report: AnalysisReport | undefined) => {
      if (ticket !== newest) return;
      [lastPacked, lastReport] = [packed, report];
      onRead({ ...counts, report });
    };
    // As in the reader below: a crafted value shows no report until the server puts it back.
    unpackReportNatively(packed).then(settle, () => settle(undefined));
  };
  map.observe(read);
  read();
  return () => {
    // Tickets start at 1: no read under way settles after this.
    newest = -1;
    map.unobserve(read);
  };
}

/** A reader of the map that unpacks the report only when it changed since the last read. */
export function roomAnalysisReader(): (map: Y.Map<unknown>) => RoomAnalysis {
  let lastPacked: Uint8Array | null = null;
  let lastReport: AnalysisReport | undefined;
  return (map) => {
    const { packed, counts } = mapValues(map);
    if (!(packed instanceof Uint8Array)) {
      lastPacked = null;
      lastReport = undefined;
    } else if (packed !== lastPacked) {
      lastPacked = packed;
      // Only the server writes the map; an editor's crafted value is put back within moments,
      // and until then the reader shows no report rather than failing.
      try {
        lastReport = unpackReport(packed);
      } catch {
        lastReport = undefined;
      }
    }
    return { ...counts, report: lastReport };
  };
}

function mapValues(map: Y.Map<unknown>): { packed: unknown; counts: Omit<RoomAnalysis, "report"> } {
  const { report: packed, ...counts } = Object.fromEntries(map.entries()) as Record<string, unknown>;
  return { packed, counts };
}
