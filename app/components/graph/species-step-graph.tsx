// The species–step view: species as boxes, steps as small squares, arcs labelled with coefficients
// above 1 (on zoom). The picture is the reader's own: laid out in a worker, dragged locally.
import { applyNodeChanges, Background, BackgroundVariant, Controls, type NodeChange, ReactFlow } from "@xyflow/react";
import { useEffect, useMemo, useState } from "react";
import { type Arrow, ArrowLayer, edgeLabelZoom, nodeBoxes } from "./arrow-layer";
import { CentreOnFocus, FitWhileUntouched, type FitOptions, FollowCaret, keepUnchanged, noEditingGestures, themeVariables } from "./graph-canvas";
import type { Emphasis } from "./graph-focus";
import type { ComplexGraphReport } from "./graph-model";
import type { XY } from "./layout";
import { buildSpeciesStepModel, estimateSpeciesStepSize, largestClass, type SpeciesStepModel, speciesNodeId, stepNodeId } from "./species-step-model";
import { type SpeciesNode, SpeciesNodeView, type StepNode, StepNodeView } from "./species-step-nodes";
import { useLayoutWorker } from "./use-layout-worker";

type SpeciesStepNode = SpeciesNode | StepNode;

const nodeTypes = { species: SpeciesNodeView, step: StepNodeView };
/** Step labels (11 px) stay at 9 px on screen or more: a large picture opens on its largest class, to pan or search. */
const readableZoom = Math.max(edgeLabelZoom, 9 / 11);

export function SpeciesStepGraph({ report, emphasis }: { report: ComplexGraphReport | null; emphasis: Emphasis }) {
  // The report is new only when the graph changed (see complex-graph), and so is the model.
  const model = useMemo(() => (report?.steps ? buildSpeciesStepModel(report) : null), [report]);
  const positions = useLayoutWorker<SpeciesStepModel, Record<string, XY>>(
    () => new Worker(new URL("./species-step-layout.worker.ts", import.meta.url), { type: "module" }),
    useMemo(() => (model ? { key: JSON.stringify(model), message: model } : null), [model]),
  );
  const [nodes, setNodes] = useState<SpeciesStepNode[]>([]);
  const [viewTouched, setViewTouched] = useState(false);

  // A new model is drawn once its layout arrives; until then the previous picture stays.
  useEffect(() => {
    if (!model || !positions) return;
    setNodes((previous) => {
      const before = new Map(previous.map((node) => [node.id, node]));
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
      return keepUnchanged(previous, built, (old, next) => old.type === next.type && old.data.label === next.data.label && old.data.description === next.data.description);
    });
  }, [model, positions]);

  const species = report?.species ?? [];
  const focusIds = useMemo(
    () => (emphasis.focus ? [...[...emphasis.focus.species].map((index) => speciesNodeId(species[index])), ...[...emphasis.focus.steps].map(stepNodeId)] : []),
    [emphasis.focus, species],
  );
  const focused = emphasis.focused;
  const focusedId = focused ? (focused.kind === "species" ? speciesNodeId(species[focused.index]) : stepNodeId(focused.index)) : undefined;
  // The view opens on the largest linkage class: its steps and their species.
  const fitOptions = useMemo((): FitOptions => {
    const plain = { padding: 0.1, maxZoom: 1.15, minZoom: readableZoom };
    const largest = model ? largestClass(model) : null;
    if (!model || largest === null) return plain;
    const steps = new Set(model.nodes.filter((node) => node.linkageClass === largest).map((node) => node.id));
    const ids = new Set(steps);
    for (const { source, target } of model.arcs) if (steps.has(source) || steps.has(target)) [source, target].forEach((id) => ids.add(id));
    return { ...plain, nodes: [...ids].map((id) => ({ id })) };
  }, [model]);
  const caretIds = useMemo(() => (emphasis.caret ? [...emphasis.caret.steps].map(stepNodeId) : []), [emphasis.caret]);
  const litIds = useMemo(() => {
    const ids = new Set(focusIds);
    if (emphasis.caret) {
      for (const index of emphasis.caret.species) ids.add(speciesNodeId(species[index]));
      for (const index of emphasis.caret.steps) ids.add(stepNodeId(index));
    }
    return ids;
  }, [focusIds, emphasis.caret, species]);

  const shownNodes = useMemo(() => {
    const focused = new Set(focusIds);
    return nodes.map((node) => {
      const lit = litIds.has(node.id);
      const dim = emphasis.focus !== null && !focused.has(node.id);
      if (node.data.lit === lit && node.data.dim === dim) return node;
      return { ...node, data: { ...node.data, lit, dim } } as SpeciesStepNode;
    });
  }, [nodes, litIds, focusIds, emphasis.focus]);

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
        <FollowCaret caretKey={emphasis.caretKey} ids={caretIds} />
        <CentreOnFocus
          focusKey={emphasis.focusKey}
          ids={focusIds}
          minZoom={readableZoom}
          centre={focusedId}
          onCentred={() => setViewTouched(true)}
        />
      </ReactFlow>
    </div>
  );
}
