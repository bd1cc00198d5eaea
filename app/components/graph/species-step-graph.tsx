// The species–step view: species as boxes, steps as small squares, arcs labelled with coefficients
// above 1 (on zoom). The picture is the reader's own: laid out in a worker, dragged locally. Hub
// species are drawn as the reader chose (copies beside each step, left out, or once), and a focus
// may narrow the picture to its neighbourhood, laid out on its own.
import { applyNodeChanges, Background, BackgroundVariant, Controls, type NodeChange, ReactFlow } from "@xyflow/react";
import { useCallback, useEffect, useMemo, useState } from "react";
import { type Arrow, ArrowLayer, edgeLabelZoom, nodeBoxes } from "./arrow-layer";
import { useStableArray } from "./use-stable";
import { CentreOnFocus, FitWhileUntouched, type FitOptions, FollowCaret, keepUnchanged, noEditingGestures, themeVariables } from "./graph-canvas";
import type { Emphasis } from "./graph-focus";
import type { XY } from "./layout";
import type { SpeciesStepLayoutRequest } from "./species-step-layout.worker";
import { estimateSpeciesStepSize, largestClass, onlySteps, type SpeciesStepModel, speciesNodeIds, stepNodeId, withHubs } from "./species-step-model";
import { type CopyNode, CopyNodeView, type SpeciesNode, SpeciesNodeView, type StepNode, StepNodeView } from "./species-step-nodes";
import type { SpeciesViewChoice } from "./species-view-choice";
import { useLayoutWorker } from "./use-layout-worker";

type SpeciesStepNode = SpeciesNode | StepNode | CopyNode;

const nodeTypes = { species: SpeciesNodeView, step: StepNodeView, copy: CopyNodeView };
/** Step labels (11 px) stay at 9 px on screen or more: a large picture opens on its largest class, to pan or search. */
const readableZoom = Math.max(edgeLabelZoom, 9 / 11);

interface Props {
  /** Every species and step, before hubs and focus are applied. */
  model: SpeciesStepModel | null;
  /** Species (by index) used by enough steps to count as hubs. */
  hubs: readonly number[];
  choice: SpeciesViewChoice;
  emphasis: Emphasis;
}

export function SpeciesStepGraph({ model: whole, hubs, choice, emphasis }: Props) {
  const narrowed = choice.focusOnly && emphasis.focus !== null;
  // Names the way the picture is drawn; a layout made for another is not used.
  const drawing = `${choice.hubs}|${hubs.join(",")}|${narrowed ? emphasis.focusKey : ""}`;
  const focusSteps = emphasis.focus?.steps;
  // The focus matters only through `drawing` (its key), not through each new object of the same focus.
  const model = useMemo(() => {
    if (!whole) return null;
    // A hub found and shown alone is the middle of its picture: drawn once, its steps around it.
    const focusedSpecies = narrowed && emphasis.focused?.kind === "species" ? emphasis.focused.index : null;
    const drawn = withHubs(whole, new Set(hubs.filter((index) => index !== focusedSpecies)), choice.hubs);
    return narrowed && focusSteps ? onlySteps(drawn, focusSteps) : drawn;
  }, [whole, drawing]);
  const answer = useLayoutWorker<SpeciesStepLayoutRequest, { drawing: string; positions: Record<string, XY> }>(
    () => new Worker(new URL("./species-step-layout.worker.ts", import.meta.url), { type: "module" }),
    useMemo(() => (model ? { key: `${drawing}\n${JSON.stringify(model)}`, message: { drawing, model } } : null), [model, drawing]),
  );
  const positions = answer?.drawing === drawing ? answer.positions : null;
  const [nodes, setNodes] = useState<SpeciesStepNode[]>([]);
  const [viewTouched, setViewTouched] = useState(false);
  const takeView = useCallback(() => setViewTouched(true), []);
  // The way the nodes on screen are drawn; a new one starts a fresh canvas, fitted anew.
  const [drawnAs, setDrawnAs] = useState<string | null>(null);

  // A new model is drawn once its layout arrives; until then the previous picture stays. Nodes
  // keep where the reader dragged them while the picture is drawn the same way.
  useEffect(() => {
    if (!model || !positions) return;
    const sameDrawing = drawnAs === drawing;
    if (!sameDrawing) {
      setViewTouched(false);
      setDrawnAs(drawing);
    }
    setNodes((previous) => {
      const before = new Map(sameDrawing ? previous.map((node) => [node.id, node]) : []);
      const built = model.nodes.map((node): SpeciesStepNode => {
        const old = before.get(node.id);
        return {
          id: node.id,
          type: node.kind,
          ariaLabel: node.description,
          initialWidth: estimateSpeciesStepSize(node).width,
          initialHeight: estimateSpeciesStepSize(node).height,
          position: old?.position ?? positions[node.id] ?? { x: 0, y: 0 },
          data: { label: node.label, description: node.description },
        } as SpeciesStepNode;
      });
      return keepUnchanged(
        previous,
        built,
        (old, next) => old.type === next.type && old.position === next.position && old.data.label === next.data.label && old.data.description === next.data.description,
      );
    });
  }, [model, positions, drawing, drawnAs]);

  // A species may be drawn as several copies, or not at all.
  const idsOf = useMemo(() => (model ? speciesNodeIds(model) : new Map<number, string[]>()), [model]);
  const focusIds = useMemo(
    () => (emphasis.focus ? [...[...emphasis.focus.species].flatMap((index) => idsOf.get(index) ?? []), ...[...emphasis.focus.steps].map(stepNodeId)] : []),
    [emphasis.focus, idsOf],
  );
  const focused = emphasis.focused;
  const focusedId = focused ? (focused.kind === "species" ? idsOf.get(focused.index)?.[0] : stepNodeId(focused.index)) : undefined;
  // The view opens on the largest linkage class: its steps and their species.
  const fitOptions = useMemo((): FitOptions => {
    const plain = { padding: 0.1, maxZoom: 1.15, minZoom: readableZoom };
    const largest = model ? largestClass(model) : null;
    // A neighbourhood on its own is small: all of it is shown.
    if (!model || largest === null || narrowed) return plain;
    const steps = new Set(model.nodes.filter((node) => node.linkageClass === largest).map((node) => node.id));
    const ids = new Set(steps);
    for (const { source, target } of model.arcs) if (steps.has(source) || steps.has(target)) [source, target].forEach((id) => ids.add(id));
    return { ...plain, nodes: [...ids].map((id) => ({ id })) };
  }, [model, narrowed]);
  const caretIds = useMemo(() => (emphasis.caret ? [...emphasis.caret.steps].map(stepNodeId) : []), [emphasis.caret]);
  const litIds = useMemo(() => {
    const ids = new Set(focusIds);
    if (emphasis.caret) {
      for (const index of emphasis.caret.species) for (const id of idsOf.get(index) ?? []) ids.add(id);
      for (const index of emphasis.caret.steps) ids.add(stepNodeId(index));
    }
    return ids;
  }, [focusIds, emphasis.caret, idsOf]);

  const builtNodes = useMemo(() => {
    const focused = new Set(focusIds);
    return nodes.map((node) => {
      const lit = litIds.has(node.id);
      const dim = emphasis.focus !== null && !narrowed && !focused.has(node.id);
      if (node.data.lit === lit && node.data.dim === dim) return node;
      return { ...node, data: { ...node.data, lit, dim } } as SpeciesStepNode;
    });
  }, [nodes, litIds, focusIds, emphasis.focus, narrowed]);
  const shownNodes = useStableArray(builtNodes);

  const arrows = useMemo(
    () =>
      (model?.arcs ?? []).map(
        (arc): Arrow => ({
          id: arc.id,
          source: arc.source,
          target: arc.target,
          bend: 0,
          label: arc.label,
          description: arc.description,
          twoWay: arc.twoWay,
          lit: Boolean(emphasis.caret?.steps.has(arc.step) || emphasis.focus?.steps.has(arc.step)),
          dim: Boolean(emphasis.focus && !emphasis.focus.steps.has(arc.step)),
        }),
      ),
    [model, emphasis],
  );
  const boxes = useMemo(() => nodeBoxes(nodes), [nodes]);

  if (!model || model.nodes.length === 0) {
    return <div className="flex h-full items-center justify-center p-6 text-center text-sm text-muted">Species and steps appear here once the text has a reaction step.</div>;
  }
  if (nodes.length === 0) {
    return <div className="flex h-full items-center justify-center p-6 text-center text-sm text-muted">Laying out {model.nodes.length} species and steps…</div>;
  }
  return (
    <div className="relative min-h-0 flex-1" data-testid="species-step-graph">
      <ReactFlow<SpeciesStepNode>
        key={drawnAs}
        nodes={shownNodes}
        nodeTypes={nodeTypes}
        onNodesChange={(changes: NodeChange<SpeciesStepNode>[]) =>
          setNodes((current) => applyNodeChanges(changes.filter((change) => change.type === "position" || change.type === "dimensions"), current))
        }
        onMoveStart={(event) => event && setViewTouched(true)}
        {...noEditingGestures}
        onlyRenderVisibleElements={nodes.length > 250}
        fitView
        fitViewOptions={fitOptions}
        minZoom={0.05}
        maxZoom={2.5}
        style={themeVariables}
        aria-label="Species and steps"
      >
        <Background variant={BackgroundVariant.Dots} gap={22} size={1.3} />
        <Controls showInteractive={false} position="bottom-left" />
        <ArrowLayer arrows={arrows} boxes={boxes} />
        <FitWhileUntouched touched={viewTouched} fitOptions={fitOptions} />
        <FollowCaret caretKey={emphasis.caretKey} ids={caretIds} onFollowed={takeView} />
        <CentreOnFocus
          focusKey={emphasis.focusKey}
          ids={focusIds}
          minZoom={readableZoom}
          centre={focusedId}
          onCentred={takeView}
        />
      </ReactFlow>
    </div>
  );
}
