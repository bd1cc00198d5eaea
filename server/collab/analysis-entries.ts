// What the server writes into the room's `analysis` map for one report: the contract keys of
// PRODUCT.md (counts), a few more counts, and the full report for the Structure panel and graph.
import type { AnalysisReport } from "../../app/chem/analysis";
import { summarizeStructure, type StructureSummary } from "../../app/utils/version-diff";

export interface AnalysisRequest {
  id: number;
  source: string;
}

export type AnalysisResponse = { id: number } & ({ entries: Record<string, string>; summary: StructureSummary } | { failure: string });

/** Each value as JSON text: cheap to compare with what the map holds, parsed only when it changed. */
export function analysisEntries(report: AnalysisReport): { entries: Record<string, string>; summary: StructureSummary } {
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
    // As JSON text: see app/utils/analysis-map.ts.
    report: JSON.stringify(report),
  };
  const entries = Object.fromEntries(Object.entries(values).map(([key, value]) => [key, JSON.stringify(value)]));
  return { entries, summary };
}
