// Keeps a value's previous object while nothing in it changed: a new analysis report after every
// keystroke then reaches the graph's memos and React Flow as the same object, and nothing
// downstream is rebuilt or redrawn.
import { useRef } from "react";

/** The previous value while its key says nothing changed. */
export function useStable<T>(value: T, key: string): T {
  const kept = useRef<{ key: string; value: T } | null>(null);
  if (kept.current?.key !== key) kept.current = { key, value };
  return kept.current.value;
}

/**
 * The previous array while `built` holds the same items in the same order. React Flow adopts every
 * node of a new `nodes` array (at 500 steps a few milliseconds and a store update each), so a
 * rebuilt list whose nodes all kept their objects must stay the same array.
 */
export function useStableArray<T>(built: T[]): T[] {
  const kept = useRef(built);
  if (kept.current !== built && !sameItems(kept.current, built)) kept.current = built;
  return kept.current;
}

export function sameItems<T>(a: readonly T[], b: readonly T[]): boolean {
  return a.length === b.length && a.every((item, index) => item === b[index]);
}
