// The shared `layout` map holds a position for every complex an editor's graph placed, including
// complexes that existed only while a name was half typed. Positions of complexes that have left
// the text are kept for a while, so a step cut and pasted back keeps its place; once more than
// STALE_POSITIONS_KEPT have gathered they are dropped, so the map does not grow with the session.
import type * as Y from "yjs";

export const STALE_POSITIONS_KEPT = 200;

/** The layout keys to delete for a text whose complexes are `complexes` (none until there are many). */
export function stalePositions(layout: Y.Map<unknown>, complexes: string[], kept = STALE_POSITIONS_KEPT): string[] {
  const present = new Set(complexes);
  const stale = [...layout.keys()].filter((key) => !present.has(key));
  return stale.length > kept ? stale : [];
}
