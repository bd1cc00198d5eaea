// Sparse elimination modulo the prime with Markowitz pivoting: each step pivots on the entry whose
// row and column are shortest, (r − 1)(c − 1) being the most fill-in that step can create. Modulo
// a prime every non-zero entry is an exact pivot, so the order can serve sparsity alone. Singleton
// columns and rows cost 0 and go first, so the tree-like parts of a network (most of it) are
// taken without fill-in, and the cost stays near the number of non-zeros where a fixed column
// order fills in whole rows on networks whose species react at random.

import { coreKernel, type CoreKernel } from "./dense-core";
import { modularInverse, residue } from "./residues";
import type { SparseVector } from "./sparse";

/**
 * One step of the elimination: its pivot column and the rest of its pivot row, scaled so the
 * pivot is 1. The other columns were still active at this step: free, or pivots of later steps.
 */
export interface PivotRow {
  column: number;
  columns: number[];
  values: number[];
}

/**
 * How many lines (rows or columns) the pivot search examines before settling for the best entry
 * seen, as the classic Markowitz codes do: searching every line costs more than the fill it saves.
 */
const searchLimit = 4;

/**
 * The share of non-zeros in the active part from which the dense core takes over (0.1 to 0.3
 * measured alike on random networks of 1,000 and 2,000 species; without the switch the last
 * few dozen pivots of a tall matrix cost most of the time).
 */
export const denseShare = 0.1;

/**
 * The elimination's outcome: its sparse pivot rows in order, and the kernel of the dense core
 * left over (empty when sparse elimination finished). The core's columns are those of `core`'s
 * vectors; a column that is neither a step's pivot nor in the core is free.
 */
export interface ModularElimination {
  steps: PivotRow[];
  coreColumns: number[];
  core: CoreKernel;
}

/** `denseFrom` other than `denseShare` is for tests: 0 takes the dense core at once, Infinity never. */
export function markowitzElimination(rows: SparseVector[], width: number, denseFrom = denseShare): ModularElimination {
  const matrix = new ActiveMatrix(rows, width, denseFrom);
  const steps: PivotRow[] = [];
  while (!matrix.isDense()) {
    const pivot = matrix.choosePivot();
    if (!pivot) return { steps, coreColumns: [], core: { free: [], vectors: [] } };
    steps.push(matrix.eliminate(pivot.row, pivot.column));
  }
  const core = matrix.remaining();
  return { steps, coreColumns: core.columns, core: coreKernel(core.rows, core.columns) };
}

/** Items grouped by a count (a line's number of non-zeros); count 0 means absent. */
class Buckets {
  readonly byCount: Set<number>[] = [];
  private readonly counts: Int32Array;

  constructor(size: number) {
    this.counts = new Int32Array(size);
  }

  countOf(item: number): number {
    return this.counts[item];
  }

  set(item: number, count: number): void {
    const previous = this.counts[item];
    if (previous === count) return;
    if (previous > 0) this.byCount[previous].delete(item);
    if (count > 0) (this.byCount[count] ??= new Set()).add(item);
    this.counts[item] = count;
  }
}

/** The rows not yet pivoted, as maps column → residue, with each column's rows beside them. */
class ActiveMatrix {
  private readonly rows: Map<number, number>[];
  private readonly columnRows: Set<number>[];
  private readonly rowBuckets: Buckets;
  private readonly columnBuckets: Buckets;
  private activeRows = 0;
  private activeColumns = 0;
  private nonzeros = 0;

  constructor(
    input: SparseVector[],
    width: number,
    private readonly denseFrom: number,
  ) {
    this.columnRows = Array.from({ length: width }, () => new Set<number>());
    this.rows = input.map(({ indices, values }, row) => {
      const entries = new Map<number, number>();
      indices.forEach((column, k) => {
        const value = residue(values[k]);
        if (value === 0) return;
        entries.set(column, value);
        this.columnRows[column].add(row);
      });
      return entries;
    });
    this.rowBuckets = new Buckets(input.length);
    this.columnBuckets = new Buckets(width);
    this.rows.forEach((entries, row) => this.setRowCount(row, entries.size));
    this.columnRows.forEach((rows, column) => this.setColumnCount(column, rows.size));
  }

  isDense(): boolean {
    return this.nonzeros >= this.denseFrom * this.activeRows * this.activeColumns;
  }

  /** The active rows and columns, once dense elimination takes over. */
  remaining(): { rows: Map<number, number>[]; columns: number[] } {
    return { rows: this.rows.filter((entries) => entries.size > 0), columns: [...this.columnRows.keys()].filter((column) => this.columnRows[column].size > 0) };
  }

  private setRowCount(row: number, count: number): void {
    const previous = this.rowBuckets.countOf(row);
    this.activeRows += Number(count > 0) - Number(previous > 0);
    this.nonzeros += count - previous;
    this.rowBuckets.set(row, count);
  }

  private setColumnCount(column: number, count: number): void {
    this.activeColumns += Number(count > 0) - Number(this.columnBuckets.countOf(column) > 0);
    this.columnBuckets.set(column, count);
  }

  /**
   * The entry of least Markowitz cost among the lines searched, shortest lines first; null when
   * no non-zero is left. Once every line of count k has been searched, any entry left costs at
   * least k², so a candidate that cheap ends the search.
   */
  choosePivot(): { row: number; column: number } | null {
    let best: { row: number; column: number } | null = null;
    let bestCost = Infinity;
    let searched = 0;
    const longest = Math.max(this.rowBuckets.byCount.length, this.columnBuckets.byCount.length);
    for (let count = 1; count < longest; count++) {
      for (const column of this.columnBuckets.byCount[count] ?? []) {
        for (const row of this.columnRows[column]) {
          const cost = (this.rows[row].size - 1) * (count - 1);
          if (cost < bestCost) [best, bestCost] = [{ row, column }, cost];
        }
        if (bestCost <= (count - 1) ** 2 || ++searched >= searchLimit) return best;
      }
      for (const row of this.rowBuckets.byCount[count] ?? []) {
        for (const column of this.rows[row].keys()) {
          const cost = (count - 1) * (this.columnRows[column].size - 1);
          if (cost < bestCost) [best, bestCost] = [{ row, column }, cost];
        }
        if (bestCost <= (count - 1) ** 2 || ++searched >= searchLimit) return best;
      }
      if (bestCost <= count * count) return best;
    }
    return best;
  }

  /** Pivots on (row, column): clears the column from every other row and retires both lines. */
  eliminate(pivotRow: number, pivotColumn: number): PivotRow {
    const entries = this.rows[pivotRow];
    const inverse = modularInverse(entries.get(pivotColumn)!);
    const columns: number[] = [];
    const values: number[] = [];
    const touched = new Set<number>();
    for (const [column, value] of entries) {
      this.columnRows[column].delete(pivotRow);
      touched.add(column);
      if (column === pivotColumn) continue;
      columns.push(column);
      values.push(residue(value * inverse));
    }
    entries.clear();
    this.setRowCount(pivotRow, 0);
    for (const row of this.columnRows[pivotColumn]) {
      const target = this.rows[row];
      const factor = target.get(pivotColumn)!;
      target.delete(pivotColumn);
      for (let k = 0; k < columns.length; k++) {
        const column = columns[k];
        const before = target.get(column) ?? 0;
        const after = residue(before - factor * values[k]);
        if (after !== 0) {
          target.set(column, after);
          if (before === 0) this.columnRows[column].add(row);
        } else if (before !== 0) {
          target.delete(column);
          this.columnRows[column].delete(row);
        }
      }
      this.setRowCount(row, target.size);
    }
    this.columnRows[pivotColumn].clear();
    for (const column of touched) this.setColumnCount(column, this.columnRows[column].size);
    return { column: pivotColumn, columns, values };
  }
}
