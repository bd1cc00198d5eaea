// One reaction as an arrow between two complex boxes (or an arc between a species and a step),
// bowed when its reverse is drawn too, with its label beside the curve once the view is zoomed in
// far enough to read it.
import { BaseEdge, type Edge, EdgeLabelRenderer, type EdgeProps, type InternalNode, useInternalNode, useStore } from "@xyflow/react";
import { type Box, edgeCurve } from "./edge-geometry";

export type ReactionEdgeData = {
  bend: number;
  label: string | null;
  /** Shown on hover, as the node boxes show theirs. */
  description: string;
  /** Ids of the arrowhead markers the graph defines once for all its edges. */
  marker: { normal: string; selected: string };
  /** A head at the start too: a reversible step's arcs in the species–step view. */
  twoWay?: boolean;
  /** Outside the focused neighbourhood: drawn faint. */
  dim?: boolean;
  /** The step under the caret, or inside the focused neighbourhood. */
  lit?: boolean;
};

export type ReactionEdge = Edge<ReactionEdgeData, "reaction">;

/** Below this zoom an edge label would be under 8 px: it is left out, node labels stay. */
export const edgeLabelZoom = 0.75;

export function ReactionEdgeView({ id, source, target, data, selected }: EdgeProps<ReactionEdge>) {
  const from = useInternalNode(source);
  const to = useInternalNode(target);
  const readable = useStore((state) => state.transform[2] >= edgeLabelZoom);
  if (!from || !to || !data) return null;
  const curve = edgeCurve(boxOf(from), boxOf(to), data.bend);
  const stressed = selected || data.lit;
  const colour = selected ? "var(--mw-accent)" : data.lit ? "var(--mw-signal)" : "var(--mw-muted)";
  const marker = `url(#${stressed ? data.marker.selected : data.marker.normal})`;
  return (
    <>
      <title>{data.description}</title>
      <BaseEdge
        id={id}
        path={curve.path}
        markerEnd={marker}
        markerStart={data.twoWay ? marker : undefined}
        interactionWidth={18}
        style={{ stroke: colour, strokeWidth: stressed ? 2.2 : 1.5, opacity: data.dim ? 0.15 : 1 }}
      />
      {data.label && readable && !data.dim && (
        <EdgeLabelRenderer>
          <div
            className="pointer-events-none absolute rounded bg-canvas/85 px-1 font-mono text-[11px] leading-4"
            style={{ transform: `translate(-50%, -50%) translate(${curve.middle.x}px, ${curve.middle.y}px)`, color: colour }}
            data-testid="edge-label"
          >
            {data.label}
          </div>
        </EdgeLabelRenderer>
      )}
    </>
  );
}

function boxOf(node: InternalNode): Box {
  const { x, y } = node.internals.positionAbsolute;
  return { x, y, width: node.measured.width ?? 0, height: node.measured.height ?? 0 };
}
