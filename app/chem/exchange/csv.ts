// The stoichiometric matrix as CSV (RFC 4180): one row per species, one column per reaction of the
// network, headed `r1: A + B -> C`; fields quoted when they hold a comma, quote or line break.
// Text cells that a spreadsheet would run as a formula get a leading apostrophe.
import type { AnalysisReport } from "~/chem/analysis";
import { MAX_CSV_EXPORT_ENTRIES } from "~/chem/limits";
import { denseStoichiometricMatrix } from "~/chem/stoichiometry";

/** What the CSV needs from the structure report. */
export type MatrixReport = Pick<AnalysisReport, "species" | "complexes" | "reactions" | "stoichiometry">;

export function csvTooLarge({ species, reactions }: Pick<AnalysisReport, "species" | "reactions">): string | null {
  const entries = species.length * reactions.length;
  return entries > MAX_CSV_EXPORT_ENTRIES ? `The stoichiometric matrix (${species.length} × ${reactions.length}) is too large to export as CSV.` : null;
}

export function stoichiometricMatrixCsv(report: MatrixReport): string {
  const refusal = csvTooLarge(report);
  if (refusal) throw new Error(refusal);
  const { species, complexes, reactions } = report;
  const matrix = denseStoichiometricMatrix(report);
  const header = ["species", ...reactions.map(({ from, to }, index) => `r${index + 1}: ${complexes[from]} -> ${complexes[to]}`)];
  const rows = species.map((name, row) => [spreadsheetText(name), ...matrix[row].map(String)]);
  return [header, ...rows].map((fields) => fields.map(csvField).join(",") + "\r\n").join("");
}

/**
 * A text cell as a spreadsheet shows it, never runs it: one starting with =, +, -, @, tab or
 * carriage return gets the usual leading apostrophe (OWASP's CSV injection advice). Numbers are
 * written from numbers, never through this: "-2.5e-3" from a number cannot hold a formula, and a
 * spreadsheet must still read it as a number.
 */
export function spreadsheetText(text: string): string {
  return formulaStart.test(text) ? `'${text}` : text;
}

/** Reads back what `spreadsheetText` wrote (a spreadsheet saving the file drops the apostrophe itself). */
export function fromSpreadsheetText(text: string): string {
  return text.startsWith("'") && formulaStart.test(text.slice(1)) ? text.slice(1) : text;
}

const formulaStart = /^[=+\-@\t\r]/;

function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
