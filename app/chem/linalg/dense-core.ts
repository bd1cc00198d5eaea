// The dense end of the modular elimination. Sparse elimination of a random-like network leaves a
// core that has filled in, often with many more rows than columns (reactions that depend on the
// others). Reducing every one of those rows would cost rows × columns² for nothing; instead the
// core's kernel is kept up to date row by row. A row lies in the span of the rows before it
// exactly when it annihilates their kernel (over a field, the row space is the kernel's
// orthogonal complement), so a dependent row costs only its non-zeros times the kernel's
// dimension, and a full-rank core stops as soon as the kernel is empty.

import { modularInverse, residue } from "./residues";

/**
 * The core's kernel modulo the prime: vectors[i] is 1 on its free column free[i], 0 on the other
 * free columns. Vectors are sparse over the caller's columns and include the 1.
 */
export interface CoreKernel {
  free: number[];
  vectors: { columns: number[]; values: number[] }[];
}

/** The kernel of the rows (maps column → residue) within the given columns. */
export function coreKernel(rows: Map<number, number>[], columns: number[]): CoreKernel {
  const width = columns.length;
  const position = new Map(columns.map((column, k) => [column, k]));
  // Starts as the identity: every column free. Dense, since the vectors fill in as rows arrive.
  const free = columns.map((_, k) => k);
  const vectors = free.map((k) => {
    const vector = new Float64Array(width);
    vector[k] = 1;
    return vector;
  });
  for (const entries of rows) {
    if (vectors.length === 0) break;
    const weights = new Float64Array(vectors.length);
    for (const [column, value] of entries) {
      const at = position.get(column)!;
      for (let i = 0; i < vectors.length; i++) {
        if (vectors[i][at] !== 0) weights[i] = residue(weights[i] + value * vectors[i][at]);
      }
    }
    const pivot = weights.findIndex((weight) => weight !== 0);
    if (pivot < 0) continue;
    // The new kernel: combinations of the old vectors that the row also annihilates. The pivot
    // vector's free column is no longer free, and the others stay 1 and 0 on theirs.
    const pivotVector = vectors[pivot];
    const support = pivotVector.reduce<number[]>((found, value, j) => (value !== 0 ? (found.push(j), found) : found), []);
    const inverse = modularInverse(weights[pivot]);
    for (let i = 0; i < vectors.length; i++) {
      if (i === pivot || weights[i] === 0) continue;
      const factor = residue(weights[i] * inverse);
      const vector = vectors[i];
      for (const j of support) vector[j] = residue(vector[j] - factor * pivotVector[j]);
    }
    vectors.splice(pivot, 1);
    free.splice(pivot, 1);
  }
  return {
    free: free.map((k) => columns[k]),
    vectors: vectors.map((vector) => {
      const sparse: CoreKernel["vectors"][number] = { columns: [], values: [] };
      vector.forEach((value, j) => {
        if (value === 0) return;
        sparse.columns.push(columns[j]);
        sparse.values.push(value);
      });
      return sparse;
    }),
  };
}
