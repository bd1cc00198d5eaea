// The graph of a mechanism, in two views. The complex graph is shared live: node positions live in
// the room's `layout` map, complexes nobody has placed yet are laid out by dagre, and dragging a
// node moves it for everyone; linkage classes fold into one box each (a reader's own choice). The
// species–step view is the reader's own picture. Both find and focus a species or a step, and light
// up the step under the editor's caret.
import "@xyflow/react/dist/style.css";
import { applyNodeChanges, Background, BackgroundVariant, Controls, type NodeChange, ReactFlow, ReactFlowProvider } from "@xyflow/react";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import type { Awareness } from "y-protocols/awareness";
import type * as Y from "yjs";
import { ClassBoxView, type ClassBoxNode } from "./class-box-node";
import { ComplexNodeView, type ComplexNode } from "./complex-node";
import { type Arrow, ArrowLayer, edgeLabelZoom, nodeBoxes } from "./arrow-layer";
import { CentreOnFocus, FitWhileUntouched, type FitOptions, FollowCaret, keepUnchanged, noEditingGestures, themeVariables } from "./graph-canvas";
import { type CaretStep, caretStepIndex, type Emphasis, type FocusTarget, neighbourhood, searchEntries } from "./graph-focus";
import { GraphLegend } from "./graph-legend";
import { buildGraphModel, type ComplexGraphReport, type GraphModel, graphKey } from "./graph-model";
import { GraphToolbar, type GraphView } from "./graph-toolbar";
import { estimateNodeSize, type XY } from "./layout";
import { linkageClassColours } from "./linkage-colours";
import { classBoxCorner, classBoxLabel, classKey, estimateClassBoxSize } from "./linkage-groups";
import { SpeciesStepGraph } from "./species-step-graph";
import { buildSpeciesStepModel, hubSpecies } from "./species-step-model";
import { useSpeciesViewChoice } from "./species-view-choice";
import { useComplexPositions } from "./use-complex-positions";
import { useHeldComplexes } from "./use-held-complexes";
import { type LinkageFolding, useLinkageFolding } from "./use-linkage-folding";
import { useStable, useStableArray } from "./use-stable";

export type { ComplexGraphReport } from "./graph-model";
export type { CaretStep } from "./graph-focus";

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
  /** The step under the editor's caret: its reactions and complexes are lit. */
  caretStep?: CaretStep | null;
  className?: string;
  /** How far fitting may zoom in; a projector lets the graph fill the screen. */
  fitMaxZoom?: number;
}

/** A selected node or arrow by its React Flow id. */
interface Chosen {
  kind: GraphSelection["kind"];
  id: string;
}

type GraphNode = ComplexNode | ClassBoxNode;

const nodeTypes = { complex: ComplexNodeView, classBox: ClassBoxView };

/** Drags reach co-authors at most this often; the final position is always written. */
const dragWriteInterval = 80;
/** The least zoom of a fit while classes are folded: node labels at 10 px, rate labels still shown. */
const readableZoom = edgeLabelZoom;
const classBoxPrefix = "class:";

export function ComplexGraph(props: ComplexGraphProps) {
  // React Flow measures the DOM; render it in the browser only and keep server markup a plain box.
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);
  return (
    <div className={`flex h-full min-h-80 flex-col ${props.className ?? ""}`} data-testid="complex-graph">
      {mounted && <GraphWorkspace {...props} />}
    </div>
  );
}

function GraphWorkspace({ report: latest, ...props }: ComplexGraphProps) {
  const { caretStep = null } = props;
  // Every analysis brings a new report; one that draws the same graph keeps the previous object,
  // so a keystroke that leaves the network alone rebuilds and redraws nothing here.
  const report = useStable(latest, useMemo(() => graphKey(latest), [latest]));
  const [view, setView] = useState<GraphView>("complexes");
  // Held by kind and name, so the focus survives edits that renumber species and steps.
  const [focused, setFocused] = useState<{ kind: FocusTarget["kind"]; name: string; at: number } | null>(null);
  const entries = useMemo(() => (report ? searchEntries(report) : []), [report]);
  const focusEntry = focused ? (entries.find(({ kind, name }) => kind === focused.kind && name === focused.name) ?? null) : null;
  const folding = useLinkageFolding(report);
  const [speciesChoice, changeSpeciesChoice] = useSpeciesViewChoice();
  const speciesModel = useMemo(() => (view === "species" && report?.steps ? buildSpeciesStepModel(report) : null), [view, report]);
  const hubs = useMemo(() => (speciesModel ? hubSpecies(speciesModel, speciesChoice.threshold) : []), [speciesModel, speciesChoice.threshold]);
  const caretIndex = report ? caretStepIndex(report, caretStep) : null;

  const emphasis = useMemo<Emphasis>(
    () => ({
      focus: report && focusEntry ? neighbourhood(report, focusEntry) : null,
      focused: focusEntry ? { kind: focusEntry.kind, index: focusEntry.index } : null,
      caret: report && caretIndex !== null ? neighbourhood(report, { kind: "step", index: caretIndex }) : null,
      focusKey: focusEntry ? `${focusEntry.kind}:${focusEntry.name}:${focused?.at}` : "",
      caretKey: caretIndex === null ? "" : `step:${caretIndex}`,
    }),
    [report, focusEntry, caretIndex, focused?.at],
  );

  const focus = (target: FocusTarget | null) => {
    const entry = target && entries.find(({ kind, index }) => kind === target.kind && index === target.index);
    setFocused(entry ? { kind: entry.kind, name: entry.name, at: Date.now() } : null);
    if (!entry || !report) return;
    // A focused neighbourhood is never hidden inside a folded class.
    const classOf = new Map(report.linkageClasses.flatMap((members, index) => members.map((member) => [member, index] as const)));
    folding.unfold([...neighbourhood(report, entry).complexes].flatMap((complex) => classOf.get(complex) ?? []));
  };

  return (
    <>
      <GraphToolbar
        view={view}
        onView={setView}
        entries={entries}
        focus={focusEntry}
        onFocus={focus}
        folding={
          view === "complexes" && report
            ? { folded: folding.folded.size, classes: report.linkageClasses.length, foldAll: folding.foldAll, unfoldAll: folding.unfoldAll }
            : undefined
        }
        speciesView={
          view === "species" && report
            ? { hubs: hubs.map((index) => report.species?.[index] ?? ""), choice: speciesChoice, onChoice: changeSpeciesChoice }
            : undefined
        }
      />
      <ReactFlowProvider key={view}>
        {view === "complexes" ? (
          <SharedComplexGraph {...props} report={report} folding={folding} emphasis={emphasis} />
        ) : (
          <SpeciesStepGraph model={speciesModel} hubs={hubs} choice={speciesChoice} emphasis={emphasis} />
        )}
      </ReactFlowProvider>
    </>
  );
}

function SharedComplexGraph({
  report,
  layout,
  canEdit,
  synced,
  awareness = null,
  onSelect,
  fitMaxZoom = 1.15,
  folding,
  emphasis,
}: ComplexGraphProps & { folding: LinkageFolding; emphasis: Emphasis }) {
  const model = useMemo(() => (report ? buildGraphModel(report) : null), [report]);
  const positions = useComplexPositions(report, layout, { canEdit, synced });
  const { held, hold } = useHeldComplexes(awareness);
  const [nodes, setNodes] = useState<GraphNode[]>([]);
  // Held by id (complex text), not index, so the same complex stays selected while the text changes.
  const [selected, setSelected] = useState<Chosen | null>(null);
  const lastWrite = useRef(new Map<string, number>());
  // Until the reader pans or zooms, the view follows the graph as complexes come and go.
  const [viewTouched, setViewTouched] = useState(false);
  const takeView = useCallback(() => setViewTouched(true), []);
  const folded = folding.folded;

  // A large mechanism starts folded: the first fit shows what is unfolded, at a readable size.
  const startedFolded = useRef<boolean | null>(null);
  if (startedFolded.current === null && model) startedFolded.current = folded.size > 0;
  const fitOptions = useMemo((): FitOptions => {
    const plain = { padding: 0.2, maxZoom: fitMaxZoom };
    if (!startedFolded.current || !model) return plain;
    const unfolded = model.nodes.filter((node) => !folded.has(node.linkageClass)).map((node) => ({ id: node.key }));
    return { ...plain, minZoom: readableZoom, nodes: unfolded.length > 0 ? unfolded : undefined };
  }, [fitMaxZoom, model, folded]);

  // Shared positions flow into the nodes, except for a node this user is dragging right now.
  useEffect(() => {
    setNodes((previous) => buildNodes(model, report, folded, positions.all, previous));
  }, [model, report, folded, positions.all]);

  const arrows = useMemo(() => {
    const classOf = new Map(model?.nodes.map((node) => [node.key, node.linkageClass]));
    return (model?.edges ?? [])
      .filter((edge) => !folded.has(classOf.get(edge.source) ?? -1))
      .map(
        (edge): Arrow => ({
          id: edge.id,
          source: edge.source,
          target: edge.target,
          bend: edge.bend,
          label: edge.label,
          description: edge.description,
          selected: selected?.kind === "reaction" && selected.id === edge.id,
          lit: Boolean(emphasis.caret?.reactions.has(edge.index) || emphasis.focus?.reactions.has(edge.index)),
          dim: Boolean(emphasis.focus && !emphasis.focus.reactions.has(edge.index)),
        }),
      );
  }, [model, folded, selected, emphasis]);

  // Selection, co-authors' holds and emphasis are laid over the nodes last; a node keeps its
  // object when none changed, so React Flow does not redraw it.
  const builtNodes = useMemo(() => {
    const lit = (complexes: readonly number[]) =>
      complexes.some((complex) => emphasis.caret?.complexes.has(complex) || emphasis.focus?.complexes.has(complex));
    const dim = (complexes: readonly number[]) => Boolean(emphasis.focus) && !complexes.some((complex) => emphasis.focus?.complexes.has(complex));
    const indexOf = new Map(model?.nodes.map((node) => [node.key, node.index]));
    return nodes.map((node): GraphNode => {
      const members = node.type === "classBox" ? (report?.linkageClasses[node.data.classIndex] ?? []) : [indexOf.get(node.id) ?? -1];
      const emphasised = { lit: lit(members), dim: dim(members) };
      if (node.type === "classBox") {
        if (node.data.lit === emphasised.lit && node.data.dim === emphasised.dim) return node;
        return { ...node, data: { ...node.data, ...emphasised } };
      }
      const chosen = selected?.kind === "complex" && selected.id === node.id;
      const heldBy = held.get(node.id);
      if (Boolean(node.selected) === chosen && node.data.heldBy === heldBy && node.data.lit === emphasised.lit && node.data.dim === emphasised.dim) return node;
      return { ...node, selected: chosen, data: { ...node.data, heldBy, ...emphasised } };
    });
  }, [nodes, selected, held, emphasis, model, report]);
  const shownNodes = useStableArray(builtNodes);

  const boxes = useMemo(() => nodeBoxes(nodes), [nodes]);
  // The caret's complexes, or the boxes of the folded classes that hold them.
  const caretIds = useMemo(() => {
    const caret = emphasis.caret;
    if (!caret || !model || !report) return [];
    const ids = model.nodes
      .filter((node) => caret.complexes.has(node.index))
      .map((node) => (folded.has(node.linkageClass) ? `${classBoxPrefix}${classKey(report, node.linkageClass)}` : node.key));
    return [...new Set(ids)];
  }, [emphasis.caret, model, report, folded]);

  // Clicks and the keyboard (Enter on a focused node) arrive as React Flow's select changes, on an
  // arrow from the arrow layer; a ref lets repeated reports of one choice reach the page once.
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
  const onNodesChange = (changes: NodeChange<GraphNode>[]) => {
    const picked = changes.find((change) => change.type === "select" && change.selected && !change.id.startsWith(classBoxPrefix));
    if (picked?.type === "select") select({ kind: "complex", id: picked.id });
    // Selection is ours (it mirrors into the text); React Flow keeps only geometry.
    const geometry = changes.filter((change) => change.type === "position" || change.type === "dimensions");
    setNodes((current) => applyNodeChanges(geometry, current));
    if (!canEdit) return;
    const now = Date.now();
    const moved: Record<string, XY> = {};
    for (const change of geometry) {
      if (change.type !== "position" || !change.position || change.id.startsWith(classBoxPrefix)) continue;
      const finished = !change.dragging;
      if (finished || now - (lastWrite.current.get(change.id) ?? 0) >= dragWriteInterval) {
        moved[change.id] = change.position;
        lastWrite.current.set(change.id, now);
      }
    }
    if (Object.keys(moved).length > 0) positions.write(moved);
  };

  // Past a few hundred nodes, drawing only what is on screen keeps pan and zoom smooth.
  const onlyVisible = shownNodes.length > 250;

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
        <ReactFlow<GraphNode>
          nodes={shownNodes}
          nodeTypes={nodeTypes}
          onNodesChange={onNodesChange}
          onNodeClick={(_, node) => node.type === "classBox" && folding.unfold([node.data.classIndex])}
          onPaneClick={() => select(null)}
          onNodeDragStart={(_, node) => hold(node.id)}
          onNodeDragStop={() => hold(null)}
          // Only the reader's own pans and zooms carry an input event; fitting reports none.
          onMoveStart={(event) => event && setViewTouched(true)}
          nodesDraggable={canEdit}
          // Moving a complex is not choosing it: the text should not jump while co-authors arrange.
          selectNodesOnDrag={false}
          {...noEditingGestures}
          onlyRenderVisibleElements={onlyVisible}
          fitView
          fitViewOptions={fitOptions}
          minZoom={0.1}
          maxZoom={Math.max(2.5, fitMaxZoom)}
          style={themeVariables}
          aria-label="Complex graph"
        >
          <Background variant={BackgroundVariant.Dots} gap={22} size={1.3} />
          <Controls showInteractive={false} position="bottom-left" />
          <ArrowLayer arrows={arrows} boxes={boxes} onPick={(id) => select({ kind: "reaction", id })} />
          <FitWhileUntouched touched={viewTouched} fitOptions={fitOptions} />
          <FollowCaret caretKey={emphasis.caretKey} ids={caretIds} jump={onlyVisible} onFollowed={takeView} />
          <CentreOnFocus
            focusKey={emphasis.focusKey}
            ids={model.nodes.filter((node) => emphasis.focus?.complexes.has(node.index)).map((node) => node.key)}
            onCentred={takeView}
          />
        </ReactFlow>
      </div>
      <GraphLegend linkageClassCount={model.linkageClassCount} folded={folded.size} fixedSpecies={Object.keys(report?.fixedSpecies ?? {})} />
    </>
  );
}

function buildNodes(
  model: GraphModel | null,
  report: ComplexGraphReport | null,
  folded: ReadonlySet<number>,
  positions: Readonly<Record<string, XY>>,
  previous: GraphNode[],
): GraphNode[] {
  if (!model || !report) return [];
  const before = new Map(previous.map((node) => [node.id, node]));
  const complexes = model.nodes
    // A complex is drawn once it has a place (the placement worker may still be at it).
    .filter((complex) => !folded.has(complex.linkageClass) && (positions[complex.key] || before.has(complex.key)))
    .map((complex): ComplexNode => {
      const old = before.get(complex.key) as ComplexNode | undefined;
      return {
        ...old,
        id: complex.key,
        type: "complex",
        ariaLabel: complex.description,
        // Used for fitting before the browser has measured the box (never, for one off screen).
        initialWidth: estimateNodeSize(complex.label).width,
        initialHeight: estimateNodeSize(complex.label).height,
        position: old?.dragging ? old.position : (positions[complex.key] ?? old?.position ?? { x: 0, y: 0 }),
        data: {
          label: complex.label,
          colours: linkageClassColours(complex.linkageClass),
          terminal: complex.terminal,
          description: complex.description,
          appeared: previous.length > 0 && !old,
          lit: old?.data.lit,
          dim: old?.data.dim,
        },
      };
    });
  const boxes = [...folded].flatMap((classIndex): ClassBoxNode[] => {
    const members = report.linkageClasses[classIndex];
    if (!members) return [];
    const id = `${classBoxPrefix}${classKey(report, classIndex)}`;
    const label = classBoxLabel(classIndex, members.length);
    const old = before.get(id) as ClassBoxNode | undefined;
    const corners = members.flatMap((member) => positions[report.complexes[member]] ?? []);
    if (corners.length === 0) return [];
    return [
      {
        ...old,
        id,
        type: "classBox",
        draggable: false,
        initialWidth: estimateClassBoxSize(label).width,
        initialHeight: estimateClassBoxSize(label).height,
        ariaLabel: `Linkage class ${classIndex + 1}, ${members.length} complexes, folded`,
        position: classBoxCorner(corners),
        data: { label, classIndex, colours: linkageClassColours(classIndex), description: `Linkage class ${classIndex + 1}: ${members.map((member) => report.complexes[member]).join(", ")}`, lit: old?.data.lit, dim: old?.data.dim },
      },
    ];
  });
  return keepUnchanged(previous, [...complexes, ...boxes], sameNode);
}

const sameNode = (old: GraphNode, next: GraphNode) =>
  old.type === next.type &&
  old.position.x === next.position.x &&
  old.position.y === next.position.y &&
  old.data.label === next.data.label &&
  old.data.description === next.data.description &&
  old.data.colours.fill === next.data.colours.fill &&
  old.data.colours.rim === next.data.colours.rim &&
  (old.type !== "complex" || next.type !== "complex" || old.data.terminal === next.data.terminal);
