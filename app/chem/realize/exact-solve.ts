// Exact linear algebra for the realization search: the solver's floating-point rates are turned
// into exact rationals that satisfy Y·A_k = M to the last digit.
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";
import { solveLinear } from "../linalg/rational-matrix";

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
