// The complex graph of a mechanism, shared live: node positions live in the room's `layout` map,
// complexes nobody has placed yet are laid out by dagre, and dragging a node moves it for everyone.
import "@xyflow/react/dist/style.css";
import {
  applyNodeChanges,
  Background,
  BackgroundVariant,
  Controls,
  type EdgeChange,
  type NodeChange,
  ReactFlow,
  ReactFlowProvider,
  useNodesInitialized,
  useReactFlow,
  useStore,
} from "@xyflow/react";
import { type CSSProperties, useEffect, useId, useMemo, useRef, useState } from "react";
import type { Awareness } from "y-protocols/awareness";
import type * as Y from "yjs";
import { ComplexNodeView, type ComplexNode } from "./complex-node";
import { GraphLegend } from "./graph-legend";
import { buildGraphModel, type ComplexGraphReport, type GraphModel } from "./graph-model";
import type { XY } from "./layout";
import { linkageClassColours } from "./linkage-colours";
import { ReactionEdgeView, type ReactionEdge } from "./reaction-edge";
import { useComplexPositions } from "./use-complex-positions";
import { useHeldComplexes } from "./use-held-complexes";

export type { ComplexGraphReport } from "./graph-model";

export interface GraphSelection {
  kind: "complex" | "reaction";
  /** Index into the report's `complexes` or `reactions`. */
  index: number;
}

export interface ComplexGraphProps {
  /** The room's analysis report (`analysis.report`); its fixed species are named in the legend. */
  report: ComplexGraphReport | null;
  /** The room's `layout` map; null before the room exists. */
  layout: Y.Map<unknown> | null;
  /** Editors share placements and drags; viewers see the shared picture and place new nodes locally. */
  canEdit: boolean;
  /** Whether the room holds the server's state; nothing is written before, so no stored layout is overwritten. */
  synced: boolean;
  /** The room's awareness: with it, a box a co-author is dragging shows who holds it. */
  awareness?: Awareness | null;
  onSelect?: (selection: GraphSelection | null) => void;
  className?: string;
  /** How far fitting may zoom in; a projector lets the graph fill the screen. */
  fitMaxZoom?: number;
}

/** A selected node or arrow by its React Flow id. */
interface Chosen {
  kind: GraphSelection["kind"];
  id: string;
}

const nodeTypes = { complex: ComplexNodeView };
const edgeTypes = { reaction: ReactionEdgeView };

/** Drags reach co-authors at most this often; the final position is always written. */
const dragWriteInterval = 80;

// React Flow's own colours, pointed at Mechweave's theme variables so both themes just work.
const themeVariables = {
  "--xy-background-color": "var(--mw-canvas)",
  "--xy-background-pattern-color": "var(--mw-line)",
  "--xy-edge-stroke": "var(--mw-muted)",
  "--xy-edge-stroke-selected": "var(--mw-accent)",
  "--xy-node-boxshadow-selected": "none",
  "--xy-controls-button-background-color": "var(--mw-raised)",
  "--xy-controls-button-background-color-hover": "var(--mw-accent-soft)",
  "--xy-controls-button-color": "var(--mw-ink)",
  "--xy-controls-button-color-hover": "var(--mw-accent)",
  "--xy-controls-button-border-color": "var(--mw-line)",
  "--xy-controls-box-shadow": "0 1px 2px rgb(0 0 0 / 0.12)",
  "--xy-attribution-background-color": "transparent",
} as CSSProperties;

export function ComplexGraph(props: ComplexGraphProps) {
  // React Flow measures the DOM; render it in the browser only and keep server markup a plain box.
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);
  return (
    <div className={`flex h-full min-h-80 flex-col ${props.className ?? ""}`} data-testid="complex-graph">
      {mounted && (
        <ReactFlowProvider>
          <SharedComplexGraph {...props} />
        </ReactFlowProvider>
      )}
    </div>
  );
}

function SharedComplexGraph({ report, layout, canEdit, synced, awareness = null, onSelect, fitMaxZoom = 1.15 }: ComplexGraphProps) {
  const fitOptions = useMemo(() => ({ padding: 0.2, maxZoom: fitMaxZoom }), [fitMaxZoom]);
  const model = useMemo(() => (report ? buildGraphModel(report) : null), [report]);
  const positions = useComplexPositions(report, layout, { canEdit, synced });
  const { held, hold } = useHeldComplexes(awareness);
  const [nodes, setNodes] = useState<ComplexNode[]>([]);
  // Held by id (complex text), not index, so the same complex stays selected while the text changes.
  const [selected, setSelected] = useState<Chosen | null>(null);
  const lastWrite = useRef(new Map<string, number>());
  // Until the reader pans or zooms, the view follows the graph as complexes come and go.
  const [viewTouched, setViewTouched] = useState(false);
  const markerBase = `mw-arrow-${useId().replace(/[^A-Za-z0-9]/g, "")}`;
  const marker = useMemo(() => ({ normal: markerBase, selected: `${markerBase}-selected` }), [markerBase]);

  // Shared positions flow into the nodes, except for a node this user is dragging right now.
  useEffect(() => {
    setNodes((previous) => buildNodes(model, positions.all, previous));
  }, [model, positions.all]);

  const previousEdges = useRef<ReactionEdge[]>([]);
  const edges = useMemo(() => {
    const built = (model?.edges ?? []).map((edge): ReactionEdge => ({
      id: edge.id,
      type: "reaction",
      source: edge.source,
      target: edge.target,
      selected: selected?.kind === "reaction" && selected.id === edge.id,
      ariaLabel: edge.description,
      data: { bend: edge.bend, label: edge.label, description: edge.description, marker },
    }));
    previousEdges.current = keepUnchanged(previousEdges.current, built, sameEdge);
    return previousEdges.current;
  }, [model, selected, marker]);

  // Selection and co-authors' holds are laid over the nodes last; a node keeps its object when
  // neither changed, so React Flow does not redraw it.
  const shownNodes = useMemo(
    () =>
      nodes.map((node) => {
        const chosen = selected?.kind === "complex" && selected.id === node.id;
        const heldBy = held.get(node.id);
        if (Boolean(node.selected) === chosen && node.data.heldBy === heldBy) return node;
        return { ...node, selected: chosen, data: { ...node.data, heldBy } };
      }),
    [nodes, selected, held],
  );

  // Clicks and the keyboard (Enter on a focused node or arrow) both arrive as React Flow's select
  // changes; a ref lets repeated reports of one choice reach the page once.
  const chosen = useRef(selected);
  const select = (next: Chosen | null) => {
    if (next?.kind === chosen.current?.kind && next?.id === chosen.current?.id) return;
    chosen.current = next;
    setSelected(next);
    if (!onSelect || !model) return;
    if (!next) return onSelect(null);
    const index =
      next.kind === "complex"
        ? model.nodes.find((node) => node.key === next.id)?.index
        : model.edges.find((edge) => edge.id === next.id)?.index;
    if (index !== undefined) onSelect({ kind: next.kind, index });
  };
  const pickFrom = (kind: Chosen["kind"], changes: (NodeChange<ComplexNode> | EdgeChange<ReactionEdge>)[]) => {
    const picked = changes.find((change) => change.type === "select" && change.selected);
    if (picked?.type === "select") select({ kind, id: picked.id });
  };

  const onNodesChange = (changes: NodeChange<ComplexNode>[]) => {
    pickFrom("complex", changes);
    // Selection is ours (it mirrors into the text); React Flow keeps only geometry.
    const geometry = changes.filter((change) => change.type === "position" || change.type === "dimensions");
    setNodes((current) => applyNodeChanges(geometry, current));
    if (!canEdit) return;
    const now = Date.now();
    const moved: Record<string, XY> = {};
    for (const change of geometry) {
      if (change.type !== "position" || !change.position) continue;
      const finished = !change.dragging;
      if (finished || now - (lastWrite.current.get(change.id) ?? 0) >= dragWriteInterval) {
        moved[change.id] = change.position;
        lastWrite.current.set(change.id, now);
      }
    }
    if (Object.keys(moved).length > 0) positions.write(moved);
  };

  if (!model || model.nodes.length === 0) {
    return (
      <div className="flex h-full items-center justify-center p-6 text-center text-sm text-muted">
        The complex graph appears here once the text has a reaction step.
      </div>
    );
  }

  return (
    <>
      <div className="relative min-h-0 flex-1">
        <ArrowheadMarkers ids={marker} />
        <ReactFlow<ComplexNode, ReactionEdge>
          nodes={shownNodes}
          edges={edges}
          nodeTypes={nodeTypes}
          edgeTypes={edgeTypes}
          onNodesChange={onNodesChange}
          onEdgesChange={(changes) => pickFrom("reaction", changes)}
          onPaneClick={() => select(null)}
          onNodeDragStart={(_, node) => hold(node.id)}
          onNodeDragStop={() => hold(null)}
          // Only the reader's own pans and zooms carry an input event; fitting reports none.
          onMoveStart={(event) => event && setViewTouched(true)}
          nodesDraggable={canEdit}
          // Moving a complex is not choosing it: the text should not jump while co-authors arrange.
          selectNodesOnDrag={false}
          nodesConnectable={false}
          edgesReconnectable={false}
          deleteKeyCode={null}
          selectionKeyCode={null}
          multiSelectionKeyCode={null}
          // Past a few hundred complexes, drawing only what is on screen keeps pan and zoom smooth.
          onlyRenderVisibleElements={model.nodes.length > 250}
          fitView
          fitViewOptions={fitOptions}
          minZoom={0.1}
          maxZoom={Math.max(2.5, fitMaxZoom)}
          style={themeVariables}
          aria-label="Complex graph"
        >
          <Background variant={BackgroundVariant.Dots} gap={22} size={1.3} />
          <Controls showInteractive={false} position="bottom-left" />
          <FitWhileUntouched touched={viewTouched} fitOptions={fitOptions} />
        </ReactFlow>
      </div>
      <GraphLegend linkageClassCount={model.linkageClassCount} fixedSpecies={Object.keys(report?.fixedSpecies ?? {})} />
    </>
  );
}

function buildNodes(model: GraphModel | null, positions: Readonly<Record<string, XY>>, previous: ComplexNode[]): ComplexNode[] {
  if (!model) return [];
  const before = new Map(previous.map((node) => [node.id, node]));
  const built = model.nodes.map((complex): ComplexNode => {
    const old = before.get(complex.key);
    return {
      ...old,
      id: complex.key,
      type: "complex",
      ariaLabel: complex.description,
      position: old?.dragging ? old.position : (positions[complex.key] ?? old?.position ?? { x: 0, y: 0 }),
      data: {
        label: complex.label,
        colours: linkageClassColours(complex.linkageClass),
        terminal: complex.terminal,
        description: complex.description,
        appeared: previous.length > 0 && !old,
      },
    };
  });
  return keepUnchanged(previous, built, sameNode);
}

/**
 * Hands React Flow the previous object wherever nothing it draws has changed: it re-renders only
 * the nodes and arrows whose objects are new, which keeps a large graph responsive while co-authors
 * type and drag.
 */
function keepUnchanged<T extends { id: string }>(previous: readonly T[], built: T[], same: (old: T, next: T) => boolean): T[] {
  const before = new Map(previous.map((item) => [item.id, item]));
  return built.map((item) => {
    const old = before.get(item.id);
    return old && same(old, item) ? old : item;
  });
}

const sameNode = (old: ComplexNode, next: ComplexNode) =>
  old.position.x === next.position.x &&
  old.position.y === next.position.y &&
  old.data.label === next.data.label &&
  old.data.terminal === next.data.terminal &&
  old.data.description === next.data.description &&
  old.data.colours.fill === next.data.colours.fill;

const sameEdge = (old: ReactionEdge, next: ReactionEdge) =>
  old.source === next.source &&
  old.target === next.target &&
  old.selected === next.selected &&
  old.ariaLabel === next.ariaLabel &&
  old.data?.bend === next.data?.bend &&
  old.data?.label === next.data?.label &&
  old.data?.description === next.data?.description &&
  old.data?.marker === next.data?.marker;

/**
 * Fits the graph when it is first drawn, and again (gliding) whenever a complex lands outside the
 * view, unless the reader has taken the view. Complexes that come and go inside it leave the zoom
 * alone, so a room watching someone type is not shaken at every keystroke.
 */
function FitWhileUntouched({ touched, fitOptions }: { touched: boolean; fitOptions: { padding: number; maxZoom: number } }) {
  const initialized = useNodesInitialized();
  const { fitView, getNodes, getNodesBounds, getViewport } = useReactFlow();
  const nodeIds = useStore((state) => [...state.nodeLookup.keys()].join("\n"));
  const width = useStore((state) => state.width);
  const height = useStore((state) => state.height);
  const fitted = useRef(false);
  useEffect(() => {
    if (!initialized || touched) return;
    if (!fitted.current) {
      fitted.current = true;
      void fitView(fitOptions);
      return;
    }
    const bounds = getNodesBounds(getNodes());
    const { x, y, zoom } = getViewport();
    const inside =
      bounds.x * zoom + x >= 0 &&
      bounds.y * zoom + y >= 0 &&
      (bounds.x + bounds.width) * zoom + x <= width &&
      (bounds.y + bounds.height) * zoom + y <= height;
    if (!inside) void fitView({ ...fitOptions, duration: 250 });
  }, [initialized, touched, nodeIds, width, height, fitView, getNodes, getNodesBounds, getViewport, fitOptions]);
  return null;
}

function ArrowheadMarkers({ ids }: { ids: { normal: string; selected: string } }) {
  return (
    <svg className="absolute h-0 w-0" aria-hidden="true">
      <defs>
        {[
          [ids.normal, "var(--mw-muted)"],
          [ids.selected, "var(--mw-accent)"],
        ].map(([id, colour]) => (
          <marker
            key={id}
            id={id}
            viewBox="0 0 10 10"
            refX="9"
            refY="5"
            markerWidth="9"
            markerHeight="9"
            markerUnits="userSpaceOnUse"
            orient="auto-start-reverse"
          >
            <path d="M 0 0.5 L 10 5 L 0 9.5 z" style={{ fill: colour }} />
          </marker>
        ))}
      </defs>
    </svg>
  );
}
