// sparse-lu.ts's symbolic factorisation, ported so that a fresh process does not run it in the
// JavaScript interpreter: the greedy minimum-degree order on the symmetrised pattern (ties to the
// lowest index, a final clique taken in index order), the fill pattern of L and U, the dense tail,
// and where each entry of s·I − J comes from (a pattern slot). Same order, same fill, so the
// factors carry the same numbers as the JavaScript solver's.

import { configureSolver } from "./lu";
import { n, patternColumn, patternStart, slotOf } from "./system";

/**
 * Plans the solver as shifted-lu.ts does: sparse when n ≥ minSize and the factors' fill stays
 * within maxFill of n², dense partial pivoting otherwise.
 */
export function planSolver(minSize: i32, maxFill: f64): void {
  if (n < minSize) {
    configureDense();
    return;
  }
  const order = new StaticArray<i32>(n);
  const joined = minimumDegreeOrder(order);
  const position = new StaticArray<i32>(n);
  for (let p = 0; p < n; p++) unchecked((position[unchecked(order[p])] = p));
  const upper = new Array<Array<i32>>(n);
  for (let p = 0; p < n; p++) {
    const around = unchecked(joined[p]);
    const list = new Array<i32>(around.length);
    for (let q = 0; q < around.length; q++) unchecked((list[q] = unchecked(position[unchecked(around[q])])));
    unchecked((upper[p] = list));
  }
  let tailStart = n;
  while (tailStart > 0 && unchecked(upper[tailStart - 1]).length == n - tailStart) tailStart--;
  // U's rows before the tail, sorted; L is their transpose (rows filled in ascending order, so sorted).
  const upperStart = new StaticArray<i32>(n + 1);
  const lowerCount = new StaticArray<i32>(n + 1);
  for (let p = 0; p < n; p++) {
    const length = p < tailStart ? unchecked(upper[p]).length : 0;
    unchecked((upperStart[p + 1] = unchecked(upperStart[p]) + length));
    if (p < tailStart) {
      const list = unchecked(upper[p]);
      for (let q = 0; q < list.length; q++) unchecked((lowerCount[unchecked(list[q]) + 1] += 1));
    }
  }
  const upperColumn = new StaticArray<i32>(unchecked(upperStart[n]));
  const lowerStart = new StaticArray<i32>(n + 1);
  for (let p = 0; p < n; p++) unchecked((lowerStart[p + 1] = unchecked(lowerStart[p]) + unchecked(lowerCount[p + 1])));
  const lowerColumn = new StaticArray<i32>(unchecked(lowerStart[n]));
  const lowerFill = new StaticArray<i32>(n);
  for (let p = 0; p < n; p++) unchecked((lowerFill[p] = unchecked(lowerStart[p])));
  for (let p = 0; p < tailStart; p++) {
    const list = unchecked(upper[p]);
    list.sort();
    const at = unchecked(upperStart[p]);
    for (let q = 0; q < list.length; q++) {
      const column = unchecked(list[q]);
      unchecked((upperColumn[at + q] = column));
      unchecked((lowerColumn[unchecked(lowerFill[column])] = p));
      unchecked((lowerFill[column] += 1));
    }
  }
  const m = n - tailStart;
  const fill = <f64>(lowerColumn.length + upperColumn.length + m * m + tailStart) / (<f64>n * <f64>n);
  if (fill > maxFill) {
    configureDense();
    return;
  }
  // Per permuted row, the off-diagonal entries of the pattern: their slot and permuted column.
  const sourceStart = new StaticArray<i32>(n + 1);
  for (let i = 0; i < n; i++) {
    const row = unchecked(position[i]);
    let count = 0;
    for (let s = unchecked(patternStart[i]); s < unchecked(patternStart[i + 1]); s++) if (unchecked(patternColumn[s]) != i) count++;
    unchecked((sourceStart[row + 1] = count));
  }
  for (let p = 0; p < n; p++) unchecked((sourceStart[p + 1] += unchecked(sourceStart[p])));
  const sourceSlot = new StaticArray<i32>(unchecked(sourceStart[n]));
  const sourceColumn = new StaticArray<i32>(sourceSlot.length);
  for (let i = 0; i < n; i++) {
    let at = unchecked(sourceStart[unchecked(position[i])]);
    for (let s = unchecked(patternStart[i]); s < unchecked(patternStart[i + 1]); s++) {
      const column = unchecked(patternColumn[s]);
      if (column == i) continue;
      unchecked((sourceSlot[at] = s));
      unchecked((sourceColumn[at] = unchecked(position[column])));
      at++;
    }
  }
  const diagonalSlot = new StaticArray<i32>(n);
  for (let p = 0; p < n; p++) {
    const original = unchecked(order[p]);
    unchecked((diagonalSlot[p] = slotOf(original, original)));
  }
  configureSolver(true, order, sourceStart, sourceSlot, sourceColumn, lowerStart, lowerColumn, upperStart, upperColumn, diagonalSlot, tailStart);
}

function configureDense(): void {
  const none = new StaticArray<i32>(0);
  configureSolver(false, none, none, none, none, none, none, none, none, none, 0);
}

/**
 * Greedy minimum degree on the symmetrised pattern; fills `order` and returns, per position, the
 * (original) nodes it is joined to when eliminated — its row of U, fill included.
 */
function minimumDegreeOrder(order: StaticArray<i32>): Array<Array<i32>> {
  const stamp = new StaticArray<i32>(n);
  let currentStamp = 0;
  const neighbours = new Array<Array<i32>>(n);
  for (let i = 0; i < n; i++) unchecked((neighbours[i] = new Array<i32>()));
  for (let i = 0; i < n; i++) {
    for (let s = unchecked(patternStart[i]); s < unchecked(patternStart[i + 1]); s++) {
      const j = unchecked(patternColumn[s]);
      if (j == i) continue;
      unchecked(neighbours[i]).push(j);
      unchecked(neighbours[j]).push(i);
    }
  }
  for (let i = 0; i < n; i++) {
    currentStamp++;
    const list = unchecked(neighbours[i]);
    const unique = new Array<i32>();
    for (let q = 0; q < list.length; q++) {
      const v = unchecked(list[q]);
      if (unchecked(stamp[v]) == currentStamp) continue;
      unchecked((stamp[v] = currentStamp));
      unique.push(v);
    }
    unchecked((neighbours[i] = unique));
  }
  const eliminated = new StaticArray<bool>(n);
  const joined = new Array<Array<i32>>(n);
  for (let p = 0; p < n; p++) {
    let best = -1;
    for (let v = 0; v < n; v++) {
      if (unchecked(eliminated[v])) continue;
      if (best < 0 || unchecked(neighbours[v]).length < unchecked(neighbours[best]).length) best = v;
    }
    if (unchecked(neighbours[best]).length == n - p - 1) {
      // A clique is left: its nodes go in index order, each joined to those after it.
      const rest = new Array<i32>();
      for (let v = 0; v < n; v++) if (!unchecked(eliminated[v])) rest.push(v);
      for (let q = 0; q < rest.length; q++) {
        unchecked((order[p + q] = unchecked(rest[q])));
        unchecked((joined[p + q] = rest.slice(q + 1)));
      }
      break;
    }
    unchecked((order[p] = best));
    unchecked((eliminated[best] = true));
    const around = unchecked(neighbours[best]);
    unchecked((joined[p] = around));
    for (let q = 0; q < around.length; q++) {
      const a = unchecked(around[q]);
      const list = unchecked(neighbours[a]);
      currentStamp++;
      unchecked((stamp[a] = currentStamp));
      for (let r = 0; r < list.length; r++) unchecked((stamp[unchecked(list[r])] = currentStamp));
      const at = list.indexOf(best);
      unchecked((list[at] = unchecked(list[list.length - 1])));
      list.pop();
      for (let r = 0; r < around.length; r++) {
        const b = unchecked(around[r]);
        if (unchecked(stamp[b]) != currentStamp) list.push(b);
      }
    }
  }
  return joined;
}
