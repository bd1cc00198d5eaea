// The stoichiometric matrix as CSV (RFC 4180): one row per species, one column per reaction of the
// network, headed `r1: A + B -> C`; fields quoted when they hold a comma, quote or line break.
import type { AnalysisReport } from "~/chem/analysis";
import { denseStoichiometricMatrix } from "~/chem/stoichiometry";

/** What the CSV needs from the structure report. */
export type MatrixReport = Pick<AnalysisReport, "species" | "complexes" | "reactions" | "stoichiometry">;

/** Beyond this many entries (tens of megabytes of text) a spreadsheet is the wrong tool. */
export const csvEntryLimit = 2_000_000;

export function csvTooLarge({ species, reactions }: Pick<AnalysisReport, "species" | "reactions">): string | null {
  const entries = species.length * reactions.length;
  return entries > csvEntryLimit ? `The stoichiometric matrix (${species.length} × ${reactions.length}) is too large to export as CSV.` : null;
}

export function stoichiometricMatrixCsv(report: MatrixReport): string {
  const refusal = csvTooLarge(report);
  if (refusal) throw new Error(refusal);
  const { species, complexes, reactions } = report;
  const matrix = denseStoichiometricMatrix(report);
  const header = ["species", ...reactions.map(({ from, to }, index) => `r${index + 1}: ${complexes[from]} -> ${complexes[to]}`)];
  const rows = species.map((name, row) => [name, ...matrix[row].map(String)]);
  return [header, ...rows].map((fields) => fields.map(csvField).join(",") + "\r\n").join("");
}

function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
