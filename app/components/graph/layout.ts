// Where complexes without a shared position go: dagre lays each linkage class out left to right,
// new complexes join their class beside their placed neighbours, off the arrows already drawn, and
// classes new as a whole are shelved in rows below everything drawn.
import dagre from "@dagrejs/dagre";
import { packInRows } from "./shelf-packing";

export interface XY {
  x: number;
  y: number;
}

export interface Size {
  width: number;
  height: number;
}

export interface PlacementInput {
  /** Node keys by complex index. */
  keys: string[];
  reactions: { from: number; to: number }[];
  linkageClasses: number[][];
  /** Top-left corners already known (shared or placed before); never moved. */
  known: Readonly<Record<string, XY>>;
  sizeOf: (key: string) => Size;
}

const classGap = 56;
/** Between the ranks of a class laid out left to right. */
const rankGap = 72;
const nodeGap = 24;
const arrowClearance = 22;
const arrowStep = 16;
/** Bounds the downward search for a free spot, so a crowded picture cannot stall placement. */
const maxAttempts = 400;

interface Drawn {
  at: XY;
  size: Size;
}

/** Size a node will have before the browser has measured it: monospace label plus padding. */
export function estimateNodeSize(label: string): Size {
  return { width: Math.max(52, Math.round(label.length * 8.4 + 30)), height: 39 };
}

/** Top-left positions for every key not in `known`. */
export function placeComplexes({ keys, reactions, linkageClasses, known, sizeOf }: PlacementInput): Record<string, XY> {
  const placed: Record<string, XY> = {};
  const present = new Set(keys);
  const occupied: Drawn[] = Object.entries(known)
    .filter(([key]) => present.has(key))
    .map(([key, at]) => ({ at, size: sizeOf(key) }));
  // A complex missing from every class (a report caught mid-change) still gets a place of its own.
  const covered = new Set(linkageClasses.flat());
  const classes = [...linkageClasses, ...keys.flatMap((_, index) => (covered.has(index) ? [] : [[index]]))];

  const edges = reactions.map(({ from, to }) => [keys[from], keys[to]] as const);
  const centre = (key: string): XY => ({ x: known[key].x + sizeOf(key).width / 2, y: known[key].y + sizeOf(key).height / 2 });
  // Only arrows between complexes drawn before: a class laid out afresh keeps dagre's own picture.
  const drawnArrows: Segment[] = edges.filter(([from, to]) => from in known && to in known).map(([from, to]) => [centre(from), centre(to)]);
  const place = (key: string, at: XY, arrows: readonly Segment[]) => {
    const size = sizeOf(key);
    placed[key] = clearOf(at, size, occupied, arrows);
    occupied.push({ at: placed[key], size });
  };

  const fresh: string[][] = [];
  for (const members of classes) {
    const memberKeys = members.map((index) => keys[index]);
    if (memberKeys.every((key) => key in known)) continue;
    const drawn = memberKeys.filter((key) => key in known);

    if (drawn.length === 0) {
      fresh.push(memberKeys);
      continue;
    }

    // Grow outward from what is drawn: each new complex sits where dagre would put it relative to
    // its already-placed neighbours, wherever co-authors have dragged those. Dagre sees only the new
    // complexes and their neighbours, so adding one complex to a large class stays cheap.
    const neighbours = neighbourMap(memberKeys, edges);
    const around = new Set(memberKeys.filter((key) => !(key in known)).flatMap((key) => [key, ...(neighbours.get(key) ?? [])]));
    const local = layoutClass([...around], edges, sizeOf);
    const where = (key: string): XY | undefined => known[key] ?? placed[key];
    const queue = [...drawn];
    const reached = new Set(drawn);
    for (let next = queue.shift(); next !== undefined; next = queue.shift()) {
      for (const key of neighbours.get(next) ?? []) {
        if (reached.has(key)) continue;
        reached.add(key);
        queue.push(key);
        const anchors = [...(neighbours.get(key) ?? [])].filter((neighbour) => where(neighbour) !== undefined);
        const shift = meanOffset(anchors, where, local);
        place(key, { x: local[key].x + shift.x, y: local[key].y + shift.y }, drawnArrows);
      }
    }
    // Members no reaction reaches (a report caught mid-change) are shelved like a new class.
    const stray = memberKeys.filter((key) => where(key) === undefined);
    if (stray.length > 0) fresh.push(stray);
  }

  // Classes entirely new keep dagre's shape each and are shelved in rows under everything drawn.
  if (fresh.length > 0) {
    const layouts = fresh.map((memberKeys) => normalised(layoutClass(memberKeys, edges, sizeOf), sizeOf));
    const origin = belowDrawn(occupied);
    const offsets = packInRows(
      layouts.map(({ size }) => size),
      classGap,
    );
    layouts.forEach(({ corners }, index) => {
      for (const [key, at] of Object.entries(corners)) {
        place(key, { x: origin.x + offsets[index].x + at.x, y: origin.y + offsets[index].y + at.y }, []);
      }
    });
  }
  return placed;
}

/** A class's corners moved to start at (0, 0), with the size of the box around it. */
function normalised(corners: Record<string, XY>, sizeOf: (key: string) => Size): { corners: Record<string, XY>; size: Size } {
  const entries = Object.entries(corners);
  const left = Math.min(...entries.map(([, { x }]) => x));
  const top = Math.min(...entries.map(([, { y }]) => y));
  const moved = Object.fromEntries(entries.map(([key, { x, y }]) => [key, { x: x - left, y: y - top }]));
  const width = Math.max(...entries.map(([key, { x }]) => x - left + sizeOf(key).width));
  const height = Math.max(...entries.map(([key, { y }]) => y - top + sizeOf(key).height));
  return { corners: moved, size: { width, height } };
}

function layoutClass(
  memberKeys: string[],
  edges: readonly (readonly [string, string])[],
  sizeOf: (key: string) => Size,
): Record<string, XY> {
  const pair = memberKeys.length === 2 ? edges.find(([from, to]) => from !== to && memberKeys.includes(from) && memberKeys.includes(to)) : undefined;
  if (pair) return pairLayout(pair, sizeOf);
  const graph = new dagre.graphlib.Graph();
  graph.setGraph({ rankdir: "LR", nodesep: 28, ranksep: rankGap, marginx: 0, marginy: 0 });
  graph.setDefaultEdgeLabel(() => ({}));
  const members = new Set(memberKeys);
  for (const key of memberKeys) graph.setNode(key, { ...sizeOf(key) });
  // One edge per connected pair: a reversible pair is one link for the layout's purposes.
  for (const [from, to] of edges) {
    if (members.has(from) && members.has(to) && !graph.hasEdge(to, from)) graph.setEdge(from, to);
  }
  dagre.layout(graph);
  const corners: Record<string, XY> = {};
  for (const key of memberKeys) {
    const { x, y, width, height } = graph.node(key);
    corners[key] = { x: Math.round(x - width / 2), y: Math.round(y - height / 2) };
  }
  return corners;
}

/**
 * Dagre's own picture of a class of two complexes, worked out directly: source, then target one
 * rank gap to the right, centred on one line. Most classes of a large mechanism are such pairs
 * (181 of 225 at 500 generated steps), and dagre's set-up per graph made them a fifth of the
 * first placement; `layout.test.ts` holds the two to the same corners.
 */
function pairLayout([from, to]: readonly [string, string], sizeOf: (key: string) => Size): Record<string, XY> {
  const [source, target] = [sizeOf(from), sizeOf(to)];
  const height = Math.max(source.height, target.height);
  return {
    [from]: { x: 0, y: Math.round((height - source.height) / 2) },
    [to]: { x: source.width + rankGap, y: Math.round((height - target.height) / 2) },
  };
}

function neighbourMap(memberKeys: string[], edges: readonly (readonly [string, string])[]): Map<string, Set<string>> {
  const members = new Set(memberKeys);
  const neighbours = new Map(memberKeys.map((key) => [key, new Set<string>()]));
  for (const [from, to] of edges) {
    if (!members.has(from) || !members.has(to)) continue;
    neighbours.get(from)!.add(to);
    neighbours.get(to)!.add(from);
  }
  return neighbours;
}

function meanOffset(anchors: string[], where: (key: string) => XY | undefined, local: Record<string, XY>): XY {
  const sum = anchors.reduce((total, key) => ({ x: total.x + where(key)!.x - local[key].x, y: total.y + where(key)!.y - local[key].y }), {
    x: 0,
    y: 0,
  });
  return { x: Math.round(sum.x / anchors.length), y: Math.round(sum.y / anchors.length) };
}

/** Where new classes start: under everything drawn, from its left edge. */
function belowDrawn(occupied: Drawn[]): XY {
  if (occupied.length === 0) return { x: 0, y: 0 };
  return {
    x: Math.min(...occupied.map(({ at }) => at.x)),
    y: Math.max(...occupied.map(({ at, size }) => at.y + size.height)) + classGap,
  };
}

type Segment = readonly [XY, XY];

/**
 * Moves a new node down until it overlaps no node and no arrow already drawn. Arrows are taken
 * as straight lines between centres, with room to spare for the bow of a reversible pair.
 */
function clearOf(at: XY, size: Size, occupied: Drawn[], arrows: readonly Segment[]): XY {
  let y = at.y;
  for (let attempt = 0; attempt < maxAttempts; attempt++) {
    const box = { x: at.x, y, ...size };
    const node = overlapping(box, occupied);
    if (node) y = node.at.y + node.size.height + nodeGap;
    else if (arrows.some((arrow) => crosses(arrow, box))) y += arrowStep;
    else break;
  }
  return { x: at.x, y };
}

function overlapping(box: XY & Size, occupied: Drawn[]) {
  return occupied.find(
    (other) =>
      box.x < other.at.x + other.size.width + nodeGap &&
      other.at.x < box.x + box.width + nodeGap &&
      box.y < other.at.y + other.size.height + nodeGap &&
      other.at.y < box.y + box.height + nodeGap,
  );
}

/** Whether the segment passes through the box widened by the arrow clearance (Liang–Barsky clipping). */
function crosses([a, b]: Segment, box: XY & Size): boolean {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const bounds: [number, number][] = [
    [-dx, a.x - (box.x - arrowClearance)],
    [dx, box.x + box.width + arrowClearance - a.x],
    [-dy, a.y - (box.y - arrowClearance)],
    [dy, box.y + box.height + arrowClearance - a.y],
  ];
  let enter = 0;
  let leave = 1;
  for (const [p, q] of bounds) {
    if (p === 0) {
      if (q < 0) return false;
      continue;
    }
    const t = q / p;
    if (p < 0) enter = Math.max(enter, t);
    else leave = Math.min(leave, t);
    if (enter > leave) return false;
  }
  return true;
}
