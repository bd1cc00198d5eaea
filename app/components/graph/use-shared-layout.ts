// The `layout` map of the shared document as React state: complex text → top-left corner. Every
// co-author reads and writes the same map, so all of them see one picture of the graph.
import { useCallback, useEffect, useState } from "react";
import type * as Y from "yjs";
import { layoutPosition, MAX_LAYOUT_KEY_CHARS, MAX_LAYOUT_KEYS } from "~/shared/room-document";
import type { XY } from "./layout";

export interface SharedLayout {
  positions: Readonly<Record<string, XY>>;
  /** Stores positions (rounded to whole pixels) in one transaction; a no-op without a map. */
  write(entries: Readonly<Record<string, XY>>): void;
}

export function useSharedLayout(layout: Y.Map<unknown> | null): SharedLayout {
  const [positions, setPositions] = useState<Record<string, XY>>({});

  useEffect(() => {
    if (!layout) return setPositions({});
    const read = () => setPositions(readPositions(layout));
    layout.observe(read);
    read();
    return () => layout.unobserve(read);
  }, [layout]);

  const write = useCallback(
    (entries: Readonly<Record<string, XY>>) => {
      if (layout) writePositions(layout, entries);
    },
    [layout],
  );

  return { positions, write };
}

/** Rounded positions in one transaction, skipping what the server would refuse (and the room then resync). */
export function writePositions(layout: Y.Map<unknown>, entries: Readonly<Record<string, XY>>) {
  const apply = () => {
    let free = MAX_LAYOUT_KEYS - layout.size;
    for (const [key, { x, y }] of Object.entries(entries)) {
      if (key.length > MAX_LAYOUT_KEY_CHARS || !Number.isFinite(x) || !Number.isFinite(y)) continue;
      if (!layout.has(key) && free-- <= 0) continue;
      layout.set(key, { x: Math.round(x), y: Math.round(y) });
    }
  };
  if (layout.doc) layout.doc.transact(apply);
  else apply();
}

/** Entries that are not a point (written by an older or broken client) are ignored. */
export function readPositions(layout: Y.Map<unknown>): Record<string, XY> {
  const positions: Record<string, XY> = {};
  layout.forEach((value, key) => {
    const point = layoutPosition.safeParse(value);
    if (point.success) positions[key] = point.data;
  });
  return positions;
}
