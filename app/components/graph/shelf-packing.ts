// Arranges whole linkage classes laid out for the first time in rows, like books on shelves, so a
// network of many small classes fills the wide canvas instead of one tall column.
import type { Size, XY } from "./layout";

/** The canvas is wider than tall; rows aim at about this width-to-height ratio overall. */
const aspect = 1.6;

/** Top-left offsets for blocks kept in order, left to right, then row by row. */
export function packInRows(blocks: readonly Size[], gap: number): XY[] {
  const area = blocks.reduce((sum, { width, height }) => sum + (width + gap) * (height + gap), 0);
  const rowWidth = Math.max(...blocks.map(({ width }) => width), Math.sqrt(area * aspect));
  const offsets: XY[] = [];
  let x = 0;
  let y = 0;
  let rowHeight = 0;
  for (const { width, height } of blocks) {
    if (x > 0 && x + width > rowWidth) {
      x = 0;
      y += rowHeight + gap;
      rowHeight = 0;
    }
    offsets.push({ x, y });
    x += width + gap;
    rowHeight = Math.max(rowHeight, height);
  }
  return offsets;
}
