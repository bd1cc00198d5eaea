// Exact linear algebra for the realization search: the solver's floating-point rates are turned
// into exact rationals that satisfy Y·A_k = M to the last digit.
import * as Q from "../ode/rational";
import type { Rational } from "../ode/rational";

/** Some solution of A x = b (free unknowns set to 0) by Gauss–Jordan elimination, or null if none. */
export function solveLinear(a: readonly Rational[][], b: readonly Rational[]): Rational[] | null {
  const rows = a.map((row, i) => [...row, b[i]]);
  const columns = a[0]?.length ?? 0;
  const pivots: number[] = [];
  let rank = 0;
  for (let c = 0; c < columns && rank < rows.length; c++) {
    const p = rows.findIndex((row, i) => i >= rank && !Q.isZero(row[c]));
    if (p < 0) continue;
    [rows[rank], rows[p]] = [rows[p], rows[rank]];
    const pivot = rows[rank][c];
    rows[rank] = rows[rank].map((v) => Q.div(v, pivot));
    for (let i = 0; i < rows.length; i++) {
      if (i === rank || Q.isZero(rows[i][c])) continue;
      const factor = rows[i][c];
      rows[i] = rows[i].map((v, k) => Q.sub(v, Q.mul(factor, rows[rank][k])));
    }
    pivots.push(c);
    rank++;
  }
  if (rows.slice(rank).some((row) => !Q.isZero(row[columns]))) return null;
  const x = new Array<Rational>(columns).fill(Q.ZERO);
  pivots.forEach((c, i) => (x[c] = rows[i][columns]));
  return x;
}

/**
 * The exact point nearest (in the least-squares sense) to `approximate` with Σ_k x_k·vectors[k] =
 * target: x = r − Vᵀw with (V Vᵀ) w = V r − target. Null if the target is out of reach.
 */
export function snapToExact(vectors: readonly number[][], target: readonly Rational[], approximate: readonly number[]): Rational[] | null {
  const n = target.length;
  const v = vectors.map((vector) => vector.map((e) => Q.rational(e)));
  const r = approximate.map((value) => Q.parseDecimal(value.toPrecision(12)) as Rational);
  const residual = target.map((t, s) => Q.sub(v.reduce((sum, vk, k) => Q.add(sum, Q.mul(vk[s], r[k])), Q.ZERO), t));
  const gram = Array.from({ length: n }, (_, s) =>
    Array.from({ length: n }, (_, u) => v.reduce((sum, vk) => Q.add(sum, Q.mul(vk[s], vk[u])), Q.ZERO)),
  );
  const w = solveLinear(gram, residual);
  if (!w) return null;
  return r.map((rk, k) => Q.sub(rk, v[k].reduce((sum, e, s) => Q.add(sum, Q.mul(e, w[s])), Q.ZERO)));
}
