// The stoichiometric matrix as CSV (RFC 4180): one row per species, one column per reaction of the
// network, headed `r1: A + B -> C`; fields quoted when they hold a comma, quote or line break.
import type { AnalysisReport } from "~/chem/analysis";

/** What the CSV needs from the structure report. */
export type MatrixReport = Pick<AnalysisReport, "species" | "complexes" | "reactions" | "stoichiometricMatrix">;

export function stoichiometricMatrixCsv(report: MatrixReport): string {
  const { species, complexes, reactions, stoichiometricMatrix } = report;
  if (reactions.length > 0 && stoichiometricMatrix.length !== species.length) {
    // The report leaves out matrices too large to show (analysis.ts, matrixEntryLimit).
    throw new Error(`The stoichiometric matrix (${species.length} × ${reactions.length}) is too large for the report to hold.`);
  }
  const header = ["species", ...reactions.map(({ from, to }, index) => `r${index + 1}: ${complexes[from]} -> ${complexes[to]}`)];
  const rows = species.map((name, row) => [name, ...reactions.map((_, column) => String(stoichiometricMatrix[row][column]))]);
  return [header, ...rows].map((fields) => fields.map(csvField).join(",") + "\r\n").join("");
}

function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
