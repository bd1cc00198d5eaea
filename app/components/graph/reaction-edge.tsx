// One reaction as an arrow between two complex boxes, bowed when its reverse is drawn too, with
// its rate coefficient beside the curve.
import { BaseEdge, type Edge, EdgeLabelRenderer, type EdgeProps, type InternalNode, useInternalNode } from "@xyflow/react";
import { type Box, edgeCurve } from "./edge-geometry";

export type ReactionEdgeData = {
  bend: number;
  label: string | null;
  /** Shown on hover, as the node boxes show theirs. */
  description: string;
  /** Ids of the arrowhead markers the graph defines once for all its edges. */
  marker: { normal: string; selected: string };
};

export type ReactionEdge = Edge<ReactionEdgeData, "reaction">;

export function ReactionEdgeView({ id, source, target, data, selected }: EdgeProps<ReactionEdge>) {
  const from = useInternalNode(source);
  const to = useInternalNode(target);
  if (!from || !to || !data) return null;
  const curve = edgeCurve(boxOf(from), boxOf(to), data.bend);
  return (
    <>
      <title>{data.description}</title>
      <BaseEdge
        id={id}
        path={curve.path}
        markerEnd={`url(#${selected ? data.marker.selected : data.marker.normal})`}
        interactionWidth={18}
        style={{ stroke: selected ? "var(--mw-accent)" : "var(--mw-muted)", strokeWidth: selected ? 2.2 : 1.5 }}
      />
      {data.label && (
        <EdgeLabelRenderer>
          <div
            className="pointer-events-none absolute rounded bg-canvas/85 px-1 font-mono text-[11px] leading-4"
            style={{
              transform: `translate(-50%, -50%) translate(${curve.middle.x}px, ${curve.middle.y}px)`,
              color: selected ? "var(--mw-accent)" : "var(--mw-muted)",
            }}
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
