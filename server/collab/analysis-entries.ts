// What the server writes into the room's `analysis` map for one report: the contract keys of
// PRODUCT.md (counts), a few more counts, and the full report for the Structure panel and graph,
// its equations packed apart.
import type { AnalysisReport } from "../../app/chem/analysis";
import { deflateRawSync } from "node:zlib";
import type { RoomEquations, RoomReport } from "../../app/shared/analysis-map";
import { summarizeStructure, type StructureSummary } from "../../app/shared/version-diff";

export interface AnalysisRequest {
  id: number;
  source: string;
}

export interface AnalysisEntries {
  /** The counts, each as JSON text: cheap to compare with what the map holds, parsed only when it changed. */
  entries: Record<string, string>;
  /** The report without its equations, packed (app/shared/analysis-map.ts). */
  report: Uint8Array;
  /** The report's equations, packed apart. */
  equations: Uint8Array;
  summary: StructureSummary;
  /** The complexes' canonical texts: the keys of the shared `layout` map. */
  complexes: string[];
}

/** Analyses texts for the rooms: worker threads in the server (analysis-pool.ts). */
export interface Analyzer {
  analyze(source: string): Promise<AnalysisEntries>;
  /** Stops whatever runs the analyses; pending ones are abandoned. */
  stop(): void;
}

export type AnalysisResponse = { id: number } & (AnalysisEntries | { failure: string });

export function analysisEntries(report: AnalysisReport): AnalysisEntries {
  const summary = summarizeStructure(report);
  const values: Record<string, unknown> = {
    deficiency: report.deficiency,
    rank: report.rank,
    linkageClasses: summary.linkageClasses,
    species: summary.species,
    complexes: summary.complexes,
    reactions: summary.reactions,
    weaklyReversible: report.weaklyReversible,
    errors: summary.errors,
  };
  const entries = Object.fromEntries(Object.entries(values).map(([key, value]) => [key, JSON.stringify(value)]));
  const { odes, odesLatex, ...rest } = report;
  return { entries, report: pack(rest satisfies RoomReport), equations: pack({ odes, odesLatex } satisfies RoomEquations), summary, complexes: report.complexes };
}

/**
 * A packed value of the map: its JSON, raw-deflated (app/shared/analysis-map.ts unpacks it). The
 * same value always packs to the same bytes, so an unchanged one is not sent again. Node's zlib at
 * level 4 packs a 500-step report (215 KB of JSON) in about 4 ms, against 11 ms for the JavaScript
 * deflate used before at level 6, for 6% more bytes.
 */
export function pack(value: RoomReport | RoomEquations): Uint8Array {
  // A plain copy: a Buffer may view a larger pooled block, which the worker's message would carry whole.
  return new Uint8Array(deflateRawSync(JSON.stringify(value), { level: 4 }));
}
