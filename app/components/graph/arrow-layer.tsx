// Every arrow of a graph view in ONE <svg> under the nodes. React Flow draws each edge as its own
// <svg>, and at 500 steps (about 650 arrows) the browser re-layerized all of them at every painted
// frame, 50–300 ms a frame while typing; one layer paints in one go. Each arrow is a memoised
// element, so a new report redraws only the arrows whose geometry or emphasis changed.
import { EdgeLabelRenderer, useStore } from "@xyflow/react";
import { memo, useCallback, useDeferredValue, useId, useRef } from "react";
import { type Box, edgeCurve } from "./edge-geometry";
import type { XY } from "./layout";

export interface Arrow {
  id: string;
  source: string;
  target: string;
  /** Bows the curve to its left (a reversible pair's two arrows); 0 for straight. */
  bend: number;
  label: string | null;
  /** Read aloud and shown on hover. */
  description: string;
  /** A head at the start too: a reversible step's arcs in the species–step view. */
  twoWay?: boolean;
  selected?: boolean;
  /** The step under the caret, or inside the focused neighbourhood. */
  lit?: boolean;
  /** Outside the focused neighbourhood: drawn faint. */
  dim?: boolean;
}

/** Below this zoom an arrow's label would be under 8 px: it is left out, node labels stay. */
export const edgeLabelZoom = 0.75;

export interface ArrowLayerProps {
  arrows: readonly Arrow[];
  /** Where each node is drawn, by node id; arrows whose ends are missing are left out. */
  boxes: ReadonlyMap<string, Box>;
  /** A click, or Enter on a focused arrow. */
  onPick?: (id: string) => void;
}

export function ArrowLayer({ arrows, boxes, onPick }: ArrowLayerProps) {
  // A new area's arrows, and labels that a zoom brings, are drawn at low priority in slices
  // between frames: a jump across a 500-step graph mounts hundreds of them at once.
  const readable = useDeferredValue(useStore((state) => state.transform[2] >= edgeLabelZoom));
  const shown = viewedArea(useDeferredValue(useStore(viewedAreaKey)));
  const base = `mw-arrow-${useId().replace(/[^A-Za-z0-9]/g, "")}`;
  const markers = { normal: base, lit: `${base}-lit`, selected: `${base}-selected` };
  // One callback for the layer's lifetime, so a new `onPick` each render redraws no arrow.
  const latestPick = useRef(onPick);
  latestPick.current = onPick;
  const pick = useCallback((id: string) => latestPick.current?.(id), []);
  const drawn = arrows.flatMap((arrow) => {
    const from = boxes.get(arrow.source);
    const to = boxes.get(arrow.target);
    if (!from || !to) return [];
    const curve = edgeCurve(from, to, arrow.bend);
    return crossesArea(curve, shown) ? [{ arrow, curve }] : [];
  });
  return (
    <EdgeLabelRenderer>
      {/* A zero-size box at the flow's origin: the arrows overflow it in flow coordinates. */}
      <svg className="absolute top-0 left-0 h-px w-px overflow-visible" aria-label="Reaction arrows" role="group">
        <defs>
          {[
            [markers.normal, "var(--mw-muted)"],
            [markers.lit, "var(--mw-signal)"],
            [markers.selected, "var(--mw-accent)"],
          ].map(([id, colour]) => (
            <marker key={id} id={id} viewBox="0 0 10 10" refX="9" refY="5" markerWidth="9" markerHeight="9" markerUnits="userSpaceOnUse" orient="auto-start-reverse">
              <path d="M 0 0.5 L 10 5 L 0 9.5 z" style={{ fill: colour }} />
            </marker>
          ))}
        </defs>
        {drawn.map(({ arrow, curve }) => (
          <ArrowView key={arrow.id} arrow={arrow} path={curve.path} marker={arrow.selected ? markers.selected : arrow.lit ? markers.lit : markers.normal} onPick={onPick ? pick : undefined} />
        ))}
        {/* Labels after every arrow, so no arrow is drawn over another's label. */}
        {readable &&
          drawn.map(({ arrow, curve }) =>
            arrow.label && !arrow.dim ? <ArrowLabel key={arrow.id} text={arrow.label} x={Math.round(curve.middle.x)} y={Math.round(curve.middle.y)} colour={arrowColour(arrow)} /> : null,
          )}
      </svg>
    </EdgeLabelRenderer>
  );
}

interface ArrowViewProps {
  arrow: Arrow;
  path: string;
  marker: string;
  onPick?: (id: string) => void;
}

const ArrowView = memo(ArrowDrawing, (old, next) =>
  old.path === next.path && old.marker === next.marker && old.onPick === next.onPick && sameArrow(old.arrow, next.arrow),
);

function ArrowDrawing({ arrow, path, marker, onPick }: ArrowViewProps) {
  const stressed = arrow.selected || arrow.lit;
  const colour = arrowColour(arrow);
  return (
    <g
      style={{ opacity: arrow.dim ? 0.15 : 1 }}
      data-arrow={arrow.id}
      data-selected={arrow.selected || undefined}
      data-lit={arrow.lit || undefined}
      tabIndex={onPick ? 0 : undefined}
      role={onPick ? "button" : undefined}
      aria-label={arrow.description}
      onClick={() => onPick?.(arrow.id)}
      onKeyDown={(event) => event.key === "Enter" && onPick?.(arrow.id)}
    >
      <title>{arrow.description}</title>
      <path
        d={path}
        fill="none"
        style={{ stroke: colour, strokeWidth: stressed ? 2.2 : 1.5 }}
        markerEnd={`url(#${marker})`}
        markerStart={arrow.twoWay ? `url(#${marker})` : undefined}
      />
      {/* A wide invisible stroke makes a thin arrow easy to hover and hit (the layer itself lets pointers through). */}
      <path d={path} fill="none" stroke="transparent" strokeWidth={18} style={{ pointerEvents: "stroke", cursor: onPick ? "pointer" : undefined }} />
    </g>
  );
}

const arrowColour = (arrow: Arrow) => (arrow.selected ? "var(--mw-accent)" : arrow.lit ? "var(--mw-signal)" : "var(--mw-muted)");

/** A label on a plate in the canvas colour that hides the arrows under it (11 px monospace: 0.6 em a character). */
const ArrowLabel = memo(function ArrowLabel({ text, x, y, colour }: { text: string; x: number; y: number; colour: string }) {
  const width = text.length * 6.6 + 6;
  return (
    <g>
      <rect x={x - width / 2} y={y - 8} width={width} height={16} rx={3} style={{ fill: "var(--mw-canvas)", fillOpacity: 0.9 }} />
      <text x={x} y={y} textAnchor="middle" dominantBaseline="central" className="font-mono text-[11px]" style={{ fill: colour }} data-testid="edge-label">
        {text}
      </text>
    </g>
  );
});

/** Two arrows draw the same when every field matches. */
function sameArrow(old: Arrow, next: Arrow): boolean {
  const keys = Object.keys(next) as (keyof Arrow)[];
  return keys.length === Object.keys(old).length && keys.every((key) => old[key] === next[key]);
}

/**
 * The part of the flow worth drawing arrows in: the view and up to half a view around it, snapped
 * to half views, so panning redraws the layer only every half a screen; an arrow whose ends are
 * both off screen is still drawn when it crosses the area.
 */
function viewedAreaKey(state: { transform: [number, number, number]; width: number; height: number }): string {
  const [x, y, zoom] = state.transform;
  if (state.width === 0 || state.height === 0) return "";
  const stepX = state.width / zoom / 2;
  const stepY = state.height / zoom / 2;
  const left = Math.floor(-x / zoom / stepX) - 1;
  const top = Math.floor(-y / zoom / stepY) - 1;
  return [left * stepX, top * stepY, (left + 4) * stepX, (top + 4) * stepY].map((value) => value.toFixed(1)).join(" ");
}

type Area = { left: number; top: number; right: number; bottom: number } | null;

/** The snapped area back as numbers; null (draw everything) before the view has a size. */
function viewedArea(key: string): Area {
  if (!key) return null;
  const [left, top, right, bottom] = key.split(" ").map(Number);
  return { left, top, right, bottom };
}

/** Whether the box around the curve's three points meets the area. */
function crossesArea({ start, control, end }: { start: XY; control: XY; end: XY }, area: Area): boolean {
  if (!area) return true;
  const xs = [start.x, control.x, end.x];
  const ys = [start.y, control.y, end.y];
  return Math.max(...xs) >= area.left && Math.min(...xs) <= area.right && Math.max(...ys) >= area.top && Math.min(...ys) <= area.bottom;
}

/** Node boxes by id for the arrow layer: measured sizes where the browser has them, else the estimates. */
export function nodeBoxes(
  nodes: readonly { id: string; position: { x: number; y: number }; measured?: { width?: number; height?: number }; initialWidth?: number; initialHeight?: number }[],
): Map<string, Box> {
  return new Map(
    nodes.map((node) => [
      node.id,
      {
        x: node.position.x,
        y: node.position.y,
        width: node.measured?.width ?? node.initialWidth ?? 0,
        height: node.measured?.height ?? node.initialHeight ?? 0,
      },
    ]),
  );
}
