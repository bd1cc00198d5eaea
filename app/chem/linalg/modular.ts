// The kernel modulo a prime, lifted and verified: the fast path to an exact kernel. Rank mod p
// never exceeds the true rank, so a lifted kernel of dimension width − rank mod p that annihilates
// every row exactly proves both the rank and the kernel, whatever order the elimination took.

import { smallGcd } from "./integers";
import { denseShare, markowitzElimination, type ModularElimination, type PivotRow } from "./markowitz";
import { prime, reconstruct, residue } from "./residues";
import type { SparseVector } from "./sparse";

/**
 * An integer kernel basis of the rows, one vector for each free column of the elimination (1 there,
 * 0 on the other free columns; `denseFrom` as in `markowitzElimination`), or null when the rows' entries are too large for the prime, a
 * kernel vector does not lift to small rationals, or a lifted vector fails the exact check.
 */
export function modularKernel(rows: SparseVector[], width: number, denseFrom = denseShare): SparseVector[] | null {
  if (rows.some((row) => row.values.some((value) => Math.abs(value) > 2 ** 20))) return null;
  const substitution = new BackSubstitution(markowitzElimination(rows, width, denseFrom), width);
  const check = new KernelCheck(rows, width);
  const basis: SparseVector[] = [];
  for (let free = 0; free < width; free++) {
    const start = substitution.start(free);
    if (!start) continue;
    const vector = liftedVector(substitution.solve(start));
    if (!vector || !check.annihilates(vector)) return null;
    basis.push(vector);
  }
  return basis;
}

/**
 * Solves the pivot rows for x_free = 1 (other free columns 0), from the core's solution on the
 * core's columns. A step's pivot depends only on columns still active at that step, so the
 * solution is non-zero only on the steps reachable from the start through the rows that use its
 * columns: those are solved, latest step first.
 */
class BackSubstitution {
  private readonly steps: PivotRow[];
  /** users[column]: the steps whose pivot row has an entry in that column. */
  private readonly users: number[][];
  private readonly starts = new Map<number, { columns: number[]; values: number[] }>();
  private readonly x: Float64Array;

  constructor({ steps, coreColumns, core }: ModularElimination, width: number) {
    this.steps = steps;
    this.users = Array.from({ length: width }, () => []);
    const bound = new Set([...steps.map(({ column }) => column), ...coreColumns]);
    for (let column = 0; column < width; column++) if (!bound.has(column)) this.starts.set(column, { columns: [column], values: [1] });
    core.free.forEach((column, i) => this.starts.set(column, core.vectors[i]));
    steps.forEach(({ columns }, step) => {
      for (const used of columns) this.users[used].push(step);
    });
    this.x = new Float64Array(width);
  }

  /** The solution on the free column and the core's columns; undefined unless the column is free. */
  start(column: number): { columns: number[]; values: number[] } | undefined {
    return this.starts.get(column);
  }

  /** The non-zero residues of the solution, by column. */
  solve(start: { columns: number[]; values: number[] }): { column: number; value: number }[] {
    const reached = this.reach(start.columns);
    reached.sort((a, b) => b - a);
    const { x } = this;
    start.columns.forEach((column, k) => (x[column] = start.values[k]));
    for (const step of reached) {
      const { column, columns, values } = this.steps[step];
      let sum = 0;
      for (let k = 0; k < columns.length; k++) sum = residue(sum + values[k] * x[columns[k]]);
      x[column] = sum === 0 ? 0 : prime - sum;
    }
    const solution = start.columns.map((column, k) => ({ column, value: start.values[k] }));
    for (const column of start.columns) x[column] = 0;
    for (const step of reached) {
      const { column } = this.steps[step];
      if (x[column] !== 0) solution.push({ column, value: x[column] });
      x[column] = 0;
    }
    return solution;
  }

  private reach(columns: number[]): number[] {
    const seen = new Set<number>();
    const stack = columns.slice();
    while (stack.length > 0) {
      for (const step of this.users[stack.pop()!]) {
        if (seen.has(step)) continue;
        seen.add(step);
        stack.push(this.steps[step].column);
      }
    }
    return [...seen];
  }
}

/** The primitive integer vector of the smallest rationals behind the residues; null if one does not lift. */
function liftedVector(residues: { column: number; value: number }[]): SparseVector | null {
  const fractions: { column: number; numerator: number; denominator: number }[] = [];
  for (const { column, value } of residues) {
    const fraction = reconstruct(value);
    if (!fraction) return null;
    fractions.push({ column, ...fraction });
  }
  let scale = 1;
  for (const { denominator } of fractions) {
    scale = (scale / smallGcd(scale, denominator)) * denominator;
    if (scale > 2 ** 30) return null;
  }
  let divisor = 0;
  const entries = fractions.map(({ column, numerator, denominator }) => {
    const value = numerator * (scale / denominator);
    divisor = smallGcd(divisor, Math.abs(value));
    return { column, value };
  });
  entries.sort((a, b) => a.column - b.column);
  return { indices: entries.map(({ column }) => column), values: entries.map(({ value }) => value / divisor) };
}

/**
 * Whether row · vector = 0 for every row, exactly. The rows are read by column, so a check costs
 * the entries of the vector's columns only, not the whole matrix.
 */
class KernelCheck {
  /** byColumn[column]: the rows with an entry there, and the entries. */
  private readonly byColumn: { rows: number[]; values: number[] }[];
  private readonly sums: Float64Array;

  constructor(rows: SparseVector[], width: number) {
    this.byColumn = Array.from({ length: width }, () => ({ rows: [], values: [] }));
    rows.forEach(({ indices, values }, row) =>
      indices.forEach((column, k) => {
        this.byColumn[column].rows.push(row);
        this.byColumn[column].values.push(values[k]);
      }),
    );
    this.sums = new Float64Array(rows.length);
  }

  annihilates(vector: SparseVector): boolean {
    const touched: number[] = [];
    let safe = true;
    vector.indices.forEach((column, k) => {
      const { rows, values } = this.byColumn[column];
      for (let i = 0; i < rows.length; i++) {
        const sum = this.sums[rows[i]] + values[i] * vector.values[k];
        if (Math.abs(sum) > 2 ** 52) safe = false;
        this.sums[rows[i]] = sum;
        touched.push(rows[i]);
      }
    });
    let zero = true;
    for (const row of touched) {
      if (this.sums[row] !== 0) zero = false;
      this.sums[row] = 0;
    }
    return safe ? zero : this.annihilatesInBigint(vector);
  }

  /** The same check when a partial sum left the range where doubles are exact. */
  private annihilatesInBigint(vector: SparseVector): boolean {
    const sums = new Map<number, bigint>();
    vector.indices.forEach((column, k) => {
      const { rows, values } = this.byColumn[column];
      rows.forEach((row, i) => sums.set(row, (sums.get(row) ?? 0n) + BigInt(values[i]) * BigInt(vector.values[k])));
    });
    return [...sums.values()].every((sum) => sum === 0n);
  }
}
