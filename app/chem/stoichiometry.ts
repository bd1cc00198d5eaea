// The dense stoichiometric matrix (rows species, columns reactions) built from the report's
// sparse columns, for the tables and files that show every entry.
import type { AnalysisReport } from "./analysis";

export type StoichiometryReport = Pick<AnalysisReport, "species" | "stoichiometry">;

export function denseStoichiometricMatrix({ species, stoichiometry }: StoichiometryReport): number[][] {
  const matrix = species.map(() => new Array<number>(stoichiometry.length).fill(0));
  stoichiometry.forEach((column, j) => {
    for (const [row, coefficient] of column) matrix[row][j] = coefficient;
  });
  return matrix;
}
