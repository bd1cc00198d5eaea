// The room's server-written `analysis` map as clients read it. The report travels as raw-deflated
// JSON (packed by the server, server/collab/analysis-entries.ts): a fifth of the bytes of its text,
// sent to every member on every structural change, and still far cheaper for a client to read than
// Yjs decoding a large nested value. Its equations travel apart under `equations`, unpacked only by
// a reader who shows them. A reader unpacks each only when it changed.
import { inflateSync, strFromU8 } from "fflate";
import type * as Y from "yjs";
import type { AnalysisReport } from "~/chem/analysis";

/** The map's keys besides the counts, which the server reads back and rewrites. */
export const analysisFields = {
  /** The packed report, without its equations. */
  report: "report",
  /** The packed equations, apart: the graph and most panels never read them. */
  equations: "equations",
  /** A digest of the text analysed: the stored analysis belongs to the text when it matches. */
  digest: "digest",
  /** Grows with every recompute, across reloads. */
  revision: "revision",
  /** Why the current text has no analysis. */
  failure: "failure",
} as const;

/**
 * The equations of a report: at 500 steps half its bytes (the typeset ones alone 88 of 215 KB),
 * which every member would otherwise unpack on every keystroke's report.
 */
export type RoomEquations = Pick<AnalysisReport, "odes" | "odesLatex">;
/** The report as a room sends it: everything but the equations. */
export type RoomReport = Omit<AnalysisReport, keyof RoomEquations>;

/** The map's values (empty until the server's first recompute arrives). */
export interface RoomAnalysis {
  deficiency?: number;
  rank?: number;
  /** Counts; the lists themselves are in `report`. */
  linkageClasses?: number;
  species?: number;
  errors?: number;
  revision?: number;
  report?: RoomReport;
  /** Why the current text has no analysis (it ran over the time limit, say); absent once one succeeds. */
  failure?: string;
}

/** A packed value of the map (the server packs them, server/collab/analysis-entries.ts). */
export function unpack<T>(packed: Uint8Array): T {
  return JSON.parse(strFromU8(inflateSync(packed))) as T;
}

/**
 * Unpacks with the platform's own inflate where there is one (every browser, Node): at 500 steps
 * fflate's inflate on the page's thread cost a few milliseconds of every keystroke's report. The
 * bytes reach it as a response body, not a Blob, whose registration with the browser process cost
 * about 2 ms of the page's thread per 40 KB report.
 */
export async function unpackNatively<T>(packed: Uint8Array): Promise<T> {
  if (typeof DecompressionStream === "undefined") return unpack<T>(packed);
  const inflated = new Response(packed as Uint8Array<ArrayBuffer>).body!.pipeThrough(new DecompressionStream("deflate-raw"));
  return JSON.parse(await new Response(inflated).text()) as T;
}

/**
 * Unpacks the newest of a series of packed values, by the platform's inflate: the same bytes
 * object only once, and a read overtaken by a newer one is dropped. A value that is not packed,
 * or does not unpack (an editor's crafted value, put back by the server within moments), reads as
 * undefined.
 */
function newestUnpacked<T>() {
  let last: { packed: Uint8Array; value: T | undefined } | null = null;
  // Tickets start at 1: after `stop` (-1) no read under way settles.
  let newest = 0;
  return {
    read(packed: unknown, settle: (value: T | undefined) => void) {
      const ticket = ++newest;
      if (!(packed instanceof Uint8Array)) {
        last = null;
        return settle(undefined);
      }
      if (packed === last?.packed) return settle(last.value);
      const done = (value: T | undefined) => {
        if (ticket !== newest) return;
        last = { packed, value };
        settle(value);
      };
      unpackNatively<T>(packed).then(done, () => done(undefined));
    },
    stop: () => void (newest = -1),
  };
}

/**
 * Calls `onRead` with the map's counts and report now and after every change, the report unpacked
 * only when it changed. Counts and report always arrive together. Returns the unsubscribe.
 */
export function watchRoomAnalysis(map: Y.Map<unknown>, onRead: (analysis: RoomAnalysis) => void): () => void {
  const reports = newestUnpacked<RoomReport>();
  const read = () => {
    const { report, counts } = mapValues(map);
    reports.read(report, (unpacked) => onRead(unpacked ? { ...counts, report: unpacked } : counts));
  };
  map.observe(read);
  read();
  return () => {
    reports.stop();
    map.unobserve(read);
  };
}

/** Calls `onRead` with the room's equations now and whenever they change (null: none yet). Returns the unsubscribe. */
export function watchRoomEquations(map: Y.Map<unknown>, onRead: (equations: RoomEquations | null) => void): () => void {
  const equations = newestUnpacked<RoomEquations>();
  const read = () => equations.read(map.get(analysisFields.equations), (unpacked) => onRead(unpacked ?? null));
  const onChange = (event: Y.YMapEvent<unknown>) => event.keysChanged.has(analysisFields.equations) && read();
  map.observe(onChange);
  read();
  return () => {
    equations.stop();
    map.unobserve(onChange);
  };
}

/** A reader of the map that unpacks the report only when it changed since the last read. */
export function roomAnalysisReader(): (map: Y.Map<unknown>) => RoomAnalysis {
  let lastPacked: Uint8Array | null = null;
  let lastReport: RoomReport | undefined;
  return (map) => {
    const { report: packed, counts } = mapValues(map);
    if (!(packed instanceof Uint8Array)) {
      lastPacked = null;
      lastReport = undefined;
    } else if (packed !== lastPacked) {
      lastPacked = packed;
      // Only the server writes the map; an editor's crafted value is put back within moments,
      // and until then the reader shows no report rather than failing.
      try {
        lastReport = unpack<RoomReport>(packed);
      } catch {
        lastReport = undefined;
      }
    }
    return { ...counts, report: lastReport };
  };
}

function mapValues(map: Y.Map<unknown>): { report: unknown; counts: Omit<RoomAnalysis, "report"> } {
  const { report, [analysisFields.equations]: _equations, ...counts } = Object.fromEntries(map.entries()) as Record<string, unknown>;
  return { report, counts };
}
