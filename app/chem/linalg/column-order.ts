// The column order of the fraction-free elimination, and the numbering the modular path receives:
// which columns the echelon form pivots on first decides its fill-in. The modular elimination
// chooses its own pivots as it goes (Markowitz, markowitz.ts) and keeps this numbering only to
// break ties.

import { sortedVector, type SparseVector } from "./sparse";

/** Rows renumbered into elimination order, with only the columns some row uses. */
export interface OrderedProblem {
  rows: SparseVector[];
  width: number;
  /** columns[k] is the caller's column behind elimination column k. */
  columns: number[];
}

/**
 * Pivots are each row's highest column, so the last columns are eliminated first. Frequent
 * species (hubs such as H2O or ATP) come first and rare ones last: rare columns become pivots
 * early and their rows spread no fill-in into the rest, the minimum-degree idea.
 */
export function eliminationOrder(rows: SparseVector[]): OrderedProblem {
  const uses = new Map<number, number>();
  for (const row of rows) for (const index of row.indices) uses.set(index, (uses.get(index) ?? 0) + 1);
  const columns = [...uses.keys()].sort((a, b) => uses.get(b)! - uses.get(a)! || a - b);
  const position = new Map(columns.map((column, k) => [column, k]));
  const renumbered = rows.map((row) => sortedVector(row.indices.map((index) => position.get(index)!), row.values));
  return { rows: renumbered, width: columns.length, columns };
}
