// The curve of one reaction arrow between two complex boxes. Arrows run centre to centre, clipped
// at the box borders, so they look right whichever side the neighbour lies on; a bend bows the
// curve to the arrow's left, which keeps the two arrows of a reversible pair apart.
import type { Size, XY } from "./layout";

export interface Box extends XY, Size {}

export interface EdgeCurve {
  path: string;
  start: XY;
  control: XY;
  end: XY;
  /** The curve's midpoint, where its label sits. */
  middle: XY;
}

/** Space between an arrow's tip and the box it points at. */
const tipGap = 3;

export function edgeCurve(source: Box, target: Box, bend: number): EdgeCurve {
  const from = centre(source);
  const to = centre(target);
  const dx = to.x - from.x;
  const dy = to.y - from.y;
  const length = Math.hypot(dx, dy) || 1;
  const bow = bend * Math.min(48, Math.max(18, length * 0.16));
  const control = { x: (from.x + to.x) / 2 - (dy / length) * bow, y: (from.y + to.y) / 2 + (dx / length) * bow };
  const start = border(source, control, 0);
  const end = border(target, control, tipGap);
  const middle = { x: 0.25 * start.x + 0.5 * control.x + 0.25 * end.x, y: 0.25 * start.y + 0.5 * control.y + 0.25 * end.y };
  return { path: `M ${fixed(start)} Q ${fixed(control)} ${fixed(end)}`, start, control, end, middle };
}

const centre = (box: Box): XY => ({ x: box.x + box.width / 2, y: box.y + box.height / 2 });

/** Where the ray from the box's centre toward `toward` leaves the box, `gap` further out. */
function border(box: Box, toward: XY, gap: number): XY {
  const c = centre(box);
  const dx = toward.x - c.x;
  const dy = toward.y - c.y;
  const length = Math.hypot(dx, dy) || 1;
  const scale = Math.min(dx === 0 ? Infinity : box.width / 2 / Math.abs(dx), dy === 0 ? Infinity : box.height / 2 / Math.abs(dy));
  return { x: c.x + dx * scale + (dx / length) * gap, y: c.y + dy * scale + (dy / length) * gap };
}

const fixed = ({ x, y }: XY) => `${x.toFixed(1)} ${y.toFixed(1)}`;
