// Where complexes without a shared position go: dagre lays each linkage class out left to right,
// new complexes join their class near the complexes already placed, and new classes stack below.
import dagre from "@dagrejs/dagre";

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
const nodeGap = 24;

/** Size a node will have before the browser has measured it: monospace label plus padding. */
export function estimateNodeSize(label: string): Size {
  return { width: Math.max(52, Math.round(label.length * 8.4 + 30)), height: 38 };
}

/** Top-left positions for every key not in `known`. */
export function placeComplexes({ keys, reactions, linkageClasses, known, sizeOf }: PlacementInput): Record<string, XY> {
  const placed: Record<string, XY> = {};
  const present = new Set(keys);
  const occupied: { at: XY; size: Size }[] = Object.entries(known)
    .filter(([key]) => present.has(key))
    .map(([key, at]) => ({ at, size: sizeOf(key) }));
  // A complex missing from every class (a report caught mid-change) still gets a place of its own.
  const covered = new Set(linkageClasses.flat());
  const classes = [...linkageClasses, ...keys.flatMap((_, index) => (covered.has(index) ? [] : [[index]]))];

  const edges = reactions.map(({ from, to }) => [keys[from], keys[to]] as const);
  const place = (key: string, at: XY) => {
    const size = sizeOf(key);
    placed[key] = clearOf(at, size, occupied);
    occupied.push({ at: placed[key], size });
  };

  for (const members of classes) {
    const memberKeys = members.map((index) => keys[index]);
    if (memberKeys.every((key) => key in known)) continue;
    const local = layoutClass(memberKeys, edges, sizeOf);
    const drawn = memberKeys.filter((key) => key in known);

    if (drawn.length === 0) {
      // A class entirely new keeps dagre's shape and goes under everything drawn so far.
      const shift = belowAll(occupied, local);
      for (const key of memberKeys) place(key, { x: local[key].x + shift.x, y: local[key].y + shift.y });
      continue;
    }

    // Grow outward from what is drawn: each new complex sits where dagre would put it relative to
    // its already-placed neighbours, wherever co-authors have dragged those.
    const neighbours = neighbourMap(memberKeys, edges);
    const where = (key: string) => known[key] ?? placed[key];
    const queue = [...drawn];
    const reached = new Set(drawn);
    for (let next = queue.shift(); next !== undefined; next = queue.shift()) {
      for (const key of neighbours.get(next) ?? []) {
        if (reached.has(key)) continue;
        reached.add(key);
        queue.push(key);
        const anchors = [...(neighbours.get(key) ?? [])].filter((neighbour) => where(neighbour) !== undefined);
        const shift = meanOffset(anchors, where, local);
        place(key, { x: local[key].x + shift.x, y: local[key].y + shift.y });
      }
    }
    // Members no reaction reaches (a report caught mid-change) follow the class as a whole.
    const classShift = meanOffset(drawn, where, local);
    for (const key of memberKeys) {
      if (where(key) === undefined) place(key, { x: local[key].x + classShift.x, y: local[key].y + classShift.y });
    }
  }
  return placed;
}

function layoutClass(
  memberKeys: string[],
  edges: readonly (readonly [string, string])[],
  sizeOf: (key: string) => Size,
): Record<string, XY> {
  const graph = new dagre.graphlib.Graph();
  graph.setGraph({ rankdir: "LR", nodesep: 28, ranksep: 72, marginx: 0, marginy: 0 });
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

function meanOffset(anchors: string[], where: (key: string) => XY, local: Record<string, XY>): XY {
  const sum = anchors.reduce((total, key) => ({ x: total.x + where(key).x - local[key].x, y: total.y + where(key).y - local[key].y }), {
    x: 0,
    y: 0,
  });
  return { x: Math.round(sum.x / anchors.length), y: Math.round(sum.y / anchors.length) };
}

function belowAll(occupied: { at: XY; size: Size }[], local: Record<string, XY>): XY {
  const localTop = Math.min(...Object.values(local).map(({ y }) => y));
  const localLeft = Math.min(...Object.values(local).map(({ x }) => x));
  if (occupied.length === 0) return { x: -localLeft, y: -localTop };
  const bottom = Math.max(...occupied.map(({ at, size }) => at.y + size.height));
  const left = Math.min(...occupied.map(({ at }) => at.x));
  return { x: left - localLeft, y: bottom + classGap - localTop };
}

/** Moves a new node down until it overlaps nothing already drawn. */
function clearOf(at: XY, size: Size, occupied: { at: XY; size: Size }[]): XY {
  let y = at.y;
  for (let blocker = overlapping({ x: at.x, y }, size, occupied); blocker; blocker = overlapping({ x: at.x, y }, size, occupied)) {
    y = blocker.at.y + blocker.size.height + nodeGap;
  }
  return { x: at.x, y };
}

function overlapping(at: XY, size: Size, occupied: { at: XY; size: Size }[]) {
  return occupied.find(
    (other) =>
      at.x < other.at.x + other.size.width + nodeGap &&
      other.at.x < at.x + size.width + nodeGap &&
      at.y < other.at.y + other.size.height + nodeGap &&
      other.at.y < at.y + size.height + nodeGap,
  );
}
