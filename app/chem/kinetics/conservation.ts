// Linear algebra of the stoichiometric matrix S (variables × rates), in floating point: the
// conservation laws (the left kernel of S) and an orthonormal basis of the stoichiometric
// subspace (the column space of S). The structure analysis computes exact integer laws; here a
// numerical basis in reduced row-echelon form is what Newton's method and eigenvalues need.

import type { KineticSpec } from "./kinetic-system";

const TOLERANCE = 1e-9;

/** S as rows of variables, columns of rates. */
export function stoichiometricMatrix(spec: KineticSpec): number[][] {
  const rates = spec.monomials.length + spec.custom.length;
  const matrix = spec.names.map(() => new Array<number>(rates).fill(0));
  for (const { variable, rate, change } of spec.changes) matrix[variable][rate] += change;
  return matrix;
}

export interface ConservationBasis {
  /** One law per row, over the variables: w·y stays constant. */
  laws: number[][];
  /** For each law, a variable with coefficient 1 in it and 0 in every other law. */
  leading: number[];
}

/**
 * A basis of {w : wᵀS = 0}: the null space of Sᵀ from its reduced row-echelon form, one law per
 * free column — so each law owns a variable no other law mentions.
 */
export function conservationBasis(stoichiometry: number[][]): ConservationBasis {
  const n = stoichiometry.length;
  const m = n === 0 ? 0 : stoichiometry[0].length;
  const rows = Array.from({ length: m }, (_, r) => stoichiometry.map((row) => row[r]));
  const scale = rows.reduce((largest, row) => row.reduce((a, x) => Math.max(a, Math.abs(x)), largest), 1);
  const pivotColumns: number[] = [];
  let rank = 0;
  for (let column = 0; column < n && rank < m; column++) {
    let best = rank;
    for (let r = rank + 1; r < m; r++) if (Math.abs(rows[r][column]) > Math.abs(rows[best][column])) best = r;
    if (Math.abs(rows[best][column]) <= TOLERANCE * scale) continue;
    [rows[rank], rows[best]] = [rows[best], rows[rank]];
    const pivot = rows[rank][column];
    for (let c = 0; c < n; c++) rows[rank][c] /= pivot;
    for (let r = 0; r < m; r++) {
      if (r === rank || rows[r][column] === 0) continue;
      const factor = rows[r][column];
      for (let c = 0; c < n; c++) rows[r][c] -= factor * rows[rank][c];
    }
    pivotColumns.push(column);
    rank++;
  }
  const isPivot = new Set(pivotColumns);
  const leading = [...Array(n).keys()].filter((c) => !isPivot.has(c));
  const laws = leading.map((free) => {
    const law = new Array<number>(n).fill(0);
    law[free] = 1;
    pivotColumns.forEach((column, r) => (law[column] = Math.abs(rows[r][free]) <= TOLERANCE ? 0 : -rows[r][free]));
    return law;
  });
  return { laws, leading };
}

/** Orthonormal columns spanning the column space of S (modified Gram–Schmidt). */
export function stoichiometricSubspace(stoichiometry: number[][]): number[][] {
  const n = stoichiometry.length;
  const m = n === 0 ? 0 : stoichiometry[0].length;
  const basis: number[][] = [];
  for (let r = 0; r < m; r++) {
    const v = stoichiometry.map((row) => row[r]);
    const size = Math.hypot(...v);
    if (size === 0) continue;
    for (const q of basis) {
      const dot = q.reduce((sum, qi, i) => sum + qi * v[i], 0);
      for (let i = 0; i < n; i++) v[i] -= dot * q[i];
    }
    const remaining = Math.hypot(...v);
    if (remaining <= TOLERANCE * size) continue;
    basis.push(v.map((x) => x / remaining));
  }
  return basis;
}
