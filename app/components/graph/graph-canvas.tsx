// What both views of the graph share on their React Flow canvas: the theme,
// fitting while the reader has not taken the view, and keeping unchanged items' objects.
import { getViewportForBounds, useNodesInitialized, useReactFlow, useStore } from "@xyflow/react";
import { type CSSProperties, useEffect, useRef } from "react";
import { sameItems } from "./use-stable";

// React Flow's own colours, pointed at Mechweave's theme variables so both themes just work.
export const themeVariables = {
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

/**
 * Gestures neither view offers: the graph is drawn from the text, so no drawing of edges, no
 * deleting with a key and no box selection (the text is where a mechanism changes).
 */
export const noEditingGestures = {
  nodesConnectable: false,
  edgesReconnectable: false,
  deleteKeyCode: null,
  selectionKeyCode: null,
  multiSelectionKeyCode: null,
} as const;

export interface FitOptions {
  padding: number;
  maxZoom: number;
  /** Fitting never zooms out further: past it the view centres on the nodes and the reader pans. */
  minZoom?: number;
  /** The nodes to fit; all when absent. */
  nodes?: { id: string }[];
}

/**
 * Hands React Flow the previous object wherever nothing it draws has changed: it re-renders only
 * the nodes and arrows whose objects are new, which keeps a large graph responsive while co-authors
 * type and drag.
 */
export function keepUnchanged<T extends { id: string }>(previous: T[], built: T[], same: (old: T, next: T) => boolean): T[] {
  const before = new Map(previous.map((item) => [item.id, item]));
  const kept = built.map((item) => {
    const old = before.get(item.id);
    return old && same(old, item) ? old : item;
  });
  // The same array when nothing changed: a state setter then skips the render altogether.
  return sameItems(previous, kept) ? previous : kept;
}

/**
 * Fits the graph when it is first drawn, and again (gliding) whenever a fitted node lands outside
 * the view, unless the reader has taken the view. Nodes that come and go inside it leave the zoom
 * alone, so a room watching someone type is not shaken at every keystroke.
 */
export function FitWhileUntouched({ touched, fitOptions }: { touched: boolean; fitOptions: FitOptions }) {
  const initialized = useDrawable();
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
    const wanted = fitOptions.nodes ? new Set(fitOptions.nodes.map(({ id }) => id)) : null;
    const fittedNodes = getNodes().filter(({ id }) => !wanted || wanted.has(id));
    if (fittedNodes.length === 0) return;
    const bounds = getNodesBounds(fittedNodes);
    const { x, y, zoom } = getViewport();
    const inside =
      bounds.x * zoom + x >= 0 &&
      bounds.y * zoom + y >= 0 &&
      (bounds.x + bounds.width) * zoom + x <= width &&
      (bounds.y + bounds.height) * zoom + y <= height;
    // A picture held at its least readable zoom is larger than the view by design.
    const heldAtLeast = fitOptions.minZoom !== undefined && Math.abs(zoom - fitOptions.minZoom) < 1e-3;
    if (!inside && !heldAtLeast) void fitView({ ...fitOptions, duration: 250 });
  }, [initialized, touched, nodeIds, width, height, fitView, getNodes, getNodesBounds, getViewport, fitOptions]);
  return null;
}

/**
 * Whether the nodes can be fitted: all measured, or, when only what is on screen is drawn (and so
 * measured), present with the sizes estimated for them (`initialWidth`, `initialHeight`).
 */
function useDrawable(): boolean {
  const measured = useNodesInitialized();
  // Every node of ours carries estimated sizes, so looking at one tells about all.
  const estimated = useStore((state) => state.nodeLookup.values().next().value?.initialWidth !== undefined);
  return measured || estimated;
}

/**
 * Centres the view on a newly focused neighbourhood once its nodes are drawn (unfolding may have
 * just added them), and hands the view to the reader. With `minZoom`, a neighbourhood too large
 * to fit readably is not fitted: the view centres on `centre` (the focused item's own node) at
 * that zoom, and its arcs lead to the rest.
 */
export function CentreOnFocus({
  focusKey,
  ids,
  onCentred,
  minZoom,
  centre,
}: {
  focusKey: string;
  ids: string[];
  onCentred(): void;
  minZoom?: number;
  centre?: string;
}) {
  const drawable = useDrawable();
  const { fitView, getNode, getNodesBounds, setCenter } = useReactFlow();
  const width = useStore((state) => state.width);
  const height = useStore((state) => state.height);
  const done = useRef("");
  useEffect(() => {
    if (!focusKey || done.current === focusKey || !drawable || ids.length === 0) return;
    if (!ids.every((id) => getNode(id))) return;
    done.current = focusKey;
    onCentred();
    const fit = { nodes: ids.map((id) => ({ id })), padding: 0.25, maxZoom: 1.2, duration: 300 };
    const own = centre ? getNode(centre) : undefined;
    if (minZoom !== undefined && own && getViewportForBounds(getNodesBounds(ids), width, height, 0, fit.maxZoom, fit.padding).zoom < minZoom) {
      const bounds = getNodesBounds([own]);
      void setCenter(bounds.x + bounds.width / 2, bounds.y + bounds.height / 2, { zoom: minZoom, duration: 300 });
      return;
    }
    void fitView({ ...fit, minZoom });
  });
  return null;
}

/**
 * Glides the view, at its present zoom, to the step under the editor's caret when none of its
 * nodes is on screen, so moving through the text keeps the lit step in sight. `caretKey` changes
 * when the caret reaches another step; a step still being placed is followed once it is drawn, and
 * again whenever its nodes change or move (a step being typed is placed, then joins another class
 * far from where its half-typed form stood). A reader who pans away from an unchanged step stays.
 * Having moved, it calls `onFollowed`: the view is then the caret's, and no longer refitted.
 * With `jump` (a large graph, where only what is on screen is drawn) the view jumps instead:
 * every frame of a glide across it would mount and measure another band of nodes, each frame a
 * long task.
 */
export function FollowCaret({ caretKey, ids, jump = false, onFollowed }: { caretKey: string; ids: string[]; jump?: boolean; onFollowed: () => void }) {
  const { getInternalNode, getViewport, setCenter } = useReactFlow();
  const width = useStore((state) => state.width);
  const height = useStore((state) => state.height);
  // Runs again when React Flow has taken new node positions, which land after this renders.
  const nodes = useStore((state) => state.nodes);
  const done = useRef("");
  useEffect(() => {
    if (!caretKey || width === 0) return;
    const boxes = ids.flatMap((id) => {
      const node = getInternalNode(id);
      if (!node) return [];
      const { x, y } = node.internals.positionAbsolute;
      return [{ x, y, width: node.measured.width ?? node.initialWidth ?? 0, height: node.measured.height ?? node.initialHeight ?? 0 }];
    });
    if (boxes.length === 0) return;
    // Where the step's nodes are, not only which step: a step being placed moves once more.
    const followed = `${caretKey}|${ids.join(" ")}|${boxes.map((box) => `${Math.round(box.x)},${Math.round(box.y)}`).join(" ")}`;
    if (done.current === followed) return;
    done.current = followed;
    const view = getViewport();
    const onScreen = boxes.some(
      (box) => box.x * view.zoom + view.x >= 0 && box.y * view.zoom + view.y >= 0 && (box.x + box.width) * view.zoom + view.x <= width && (box.y + box.height) * view.zoom + view.y <= height,
    );
    if (onScreen) return;
    const left = Math.min(...boxes.map((box) => box.x));
    const top = Math.min(...boxes.map((box) => box.y));
    const right = Math.max(...boxes.map((box) => box.x + box.width));
    const bottom = Math.max(...boxes.map((box) => box.y + box.height));
    const fits = (right - left) * view.zoom <= width && (bottom - top) * view.zoom <= height;
    // A step whose ends lie further apart than the view shows: the end nearest to the view instead
    // of the empty middle between them.
    const centre = { x: (width / 2 - view.x) / view.zoom, y: (height / 2 - view.y) / view.zoom };
    const distance = (box: (typeof boxes)[number]) => Math.hypot(box.x + box.width / 2 - centre.x, box.y + box.height / 2 - centre.y);
    const nearest = boxes.reduce((best, box) => (distance(box) < distance(best) ? box : best));
    const [x, y] = fits ? [(left + right) / 2, (top + bottom) / 2] : [nearest.x + nearest.width / 2, nearest.y + nearest.height / 2];
    void setCenter(x, y, { zoom: view.zoom, duration: jump ? 0 : 250 });
    onFollowed();
  }, [caretKey, ids, jump, onFollowed, nodes, width, height, getInternalNode, getViewport, setCenter]);
  return null;
}
