// Sparse vectors, the shape rows and kernel vectors take throughout the exact linear algebra:
// stoichiometry is mostly zeros.

/** A sparse integer vector: strictly increasing indices and their non-zero values. */
export interface SparseVector {
  indices: number[];
  values: number[];
}

/** Sorts by index; insertion sort for the short rows stoichiometry mostly has. */
export function sortedVector(indices: number[], values: number[]): SparseVector {
  if (indices.length > 16) {
    const order = indices.map((_, k) => k).sort((a, b) => indices[a] - indices[b]);
    return { indices: order.map((k) => indices[k]), values: order.map((k) => values[k]) };
  }
  const sortedIndices = indices.slice();
  const sortedValues = values.slice();
  for (let k = 1; k < sortedIndices.length; k++) {
    const index = sortedIndices[k];
    const value = sortedValues[k];
    let at = k - 1;
    for (; at >= 0 && sortedIndices[at] > index; at--) {
      sortedIndices[at + 1] = sortedIndices[at];
      sortedValues[at + 1] = sortedValues[at];
    }
    sortedIndices[at + 1] = index;
    sortedValues[at + 1] = value;
  }
  return { indices: sortedIndices, values: sortedValues };
}

export function sparseFromDense(row: readonly number[]): SparseVector {
  const indices = row.flatMap((value, index) => (value === 0 ? [] : [index]));
  return { indices, values: indices.map((index) => row[index]) };
}

export function denseFromSparse({ indices, values }: SparseVector, width: number): number[] {
  const dense = new Array<number>(width).fill(0);
  indices.forEach((index, k) => (dense[index] = values[k]));
  return dense;
}
