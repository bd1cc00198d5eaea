// Keeps a value's previous object while its key says nothing changed: a new analysis report after
// every keystroke then reaches the graph's memos and React Flow as the same object, and nothing
// downstream is rebuilt or redrawn.
import { useRef } from "react";

export function useStable<T>(value: T, key: string): T {
  const kept = useRef<{ key: string; value: T } | null>(null);
  if (kept.current?.key !== key) kept.current = { key, value };
  return kept.current.value;
}
