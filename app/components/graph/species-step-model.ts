// The species–step (bipartite) view of a mechanism: a node per species and a small node per step,
// an arc from each reactant to its step and from the step to each product, labelled only where the
// stoichiometric coefficient exceeds 1. Laid out by a force simulation in a worker; positions stay
// with the reader (the shared layout is the complex graph's). Hub species — those most steps use,
// such as a third body — would pull every step into one knot: the reader may draw them as a small
// copy beside each step, or leave them out, and may narrow the view to a focused neighbourhood.
import { forceCollide, forceLink, forceManyBody, forceSimulation, forceX, forceY, type SimulationLinkDatum, type SimulationNodeDatum } from "d3-force";
import type { ComplexGraphReport } from "./graph-model";
import type { Size, XY } from "./layout";

export interface SpeciesStepNodeModel {
  /** `species:NAME`, `step:INDEX` or `copy:NAME@INDEX`, never the same as a complex's key. */
  id: string;
  /** A copy is a hub species drawn again beside one of its steps. */
  kind: "species" | "step" | "copy";
  /** Index into the report's `species` (a species or a copy) or `steps`. */
  index: number;
  label: string;
  description: string;
  /** A step's (and its copies') linkage class, that of its complexes; null for a species, which may join several. */
  linkageClass: number | null;
}

export interface ArcModel {
  id: string;
  source: string;
  target: string;
  /** The coefficient when it exceeds 1, else null: a plain arc means 1. */
  label: string | null;
  /** The step runs both ways: the arc has a head at each end. */
  twoWay: boolean;
  /** The step the arc belongs to, and the species it joins to it. */
  step: number;
  species: number;
  description: string;
}

export interface SpeciesStepModel {
  nodes: SpeciesStepNodeModel[];
  arcs: ArcModel[];
}

export const speciesNodeId = (name: string) => `species:${name}`;
export const stepNodeId = (index: number) => `step:${index}`;

export function buildSpeciesStepModel(report: ComplexGraphReport): SpeciesStepModel {
  const species = report.species ?? [];
  const steps = report.steps ?? [];
  const used = new Set(steps.flatMap(({ reactants, products }) => [...reactants, ...products].map(([index]) => index)));
  const nodes: SpeciesStepNodeModel[] = species.flatMap((name, index) =>
    used.has(index) ? [{ id: speciesNodeId(name), kind: "species" as const, index, label: name, description: `Species ${name}`, linkageClass: null }] : [],
  );
  const classOf = new Map(report.linkageClasses.flatMap((members, classIndex) => members.map((member) => [member, classIndex] as const)));
  const arcs: ArcModel[] = [];
  steps.forEach(({ label, line, reactants, products, reactions }, index) => {
    const name = label ?? `line ${line}`;
    const directions = new Set(reactions.map((reaction) => report.reactions[reaction]).map((each) => (each ? `${each.from}>${each.to}` : "")));
    const twoWay = directions.size > 1;
    const linkageClass = classOf.get(report.reactions[reactions[0]]?.from ?? -1) ?? null;
    nodes.push({ id: stepNodeId(index), kind: "step", index, label: name, description: `Step ${name}${twoWay ? ", reversible" : ""}`, linkageClass });
    const arc = (speciesIndex: number, coefficient: number, into: boolean) => {
      const node = speciesNodeId(species[speciesIndex]);
      const [source, target] = into ? [node, stepNodeId(index)] : [stepNodeId(index), node];
      const amount = coefficient > 1 ? String(coefficient) : null;
      arcs.push({
        id: `${source} → ${target}`,
        source,
        target,
        label: amount,
        twoWay,
        step: index,
        species: speciesIndex,
        description: `${into ? "Reactant" : "Product"} ${species[speciesIndex]} of step ${name}${amount ? `, coefficient ${amount}` : ""}`,
      });
    };
    for (const [speciesIndex, coefficient] of reactants) arc(speciesIndex, coefficient, true);
    for (const [speciesIndex, coefficient] of products) arc(speciesIndex, coefficient, false);
  });
  return { nodes, arcs };
}

/** Species boxes as the complex boxes, a copy smaller (11 px text); a step is a small square with its label beside it. */
export function estimateSpeciesStepSize(node: SpeciesStepNodeModel): Size {
  if (node.kind === "species") return { width: Math.max(44, Math.round(node.label.length * 8.4 + 26)), height: 34 };
  if (node.kind === "copy") return { width: Math.max(26, Math.round(node.label.length * 6.9 + 14)), height: 20 };
  return { width: 14, height: 14 };
}

/** How hub species are drawn: a copy beside each step that uses them, not at all, or once like any other. */
export type HubDrawing = "copies" | "hidden" | "once";

export interface HubChoice {
  drawing: HubDrawing;
  /** A species used by at least this many steps is a hub. */
  threshold: number;
}

/**
 * Common practice, no source: in the oxidation mechanisms we test, a typical species joins 7–9
 * steps and the third body or the chain carriers two to five times as many.
 */
export const defaultHubChoice: HubChoice = { drawing: "copies", threshold: 16 };

/** Species (by index) used by at least `threshold` steps, most used first. */
export function hubSpecies(model: SpeciesStepModel, threshold: number): number[] {
  const steps = new Map<number, Set<number>>();
  for (const { species, step } of model.arcs) steps.set(species, (steps.get(species) ?? new Set()).add(step));
  return [...steps]
    .filter(([, used]) => used.size >= threshold)
    .sort(([a, usedA], [b, usedB]) => usedB.size - usedA.size || a - b)
    .map(([species]) => species);
}

export const copyNodeId = (name: string, step: number) => `copy:${name}@${step}`;

/**
 * The model with the given species drawn as a copy beside each step that uses them (one copy per
 * step, shared by its arcs both ways), or left out with their arcs.
 */
export function withHubs(model: SpeciesStepModel, hubs: ReadonlySet<number>, drawing: HubDrawing): SpeciesStepModel {
  if (drawing === "once" || hubs.size === 0) return model;
  const isHub = (node: SpeciesStepNodeModel) => node.kind === "species" && hubs.has(node.index);
  const hubNames = new Map(model.nodes.filter(isHub).map((node) => [node.index, node]));
  const steps = new Map(model.nodes.filter((node) => node.kind === "step").map((node) => [node.index, node]));
  const nodes = model.nodes.filter((node) => !isHub(node));
  const copies = new Map<string, SpeciesStepNodeModel>();
  const arcs: ArcModel[] = [];
  for (const arc of model.arcs) {
    const hub = hubNames.get(arc.species);
    if (!hub) {
      arcs.push(arc);
      continue;
    }
    if (drawing === "hidden") continue;
    const copy = copyNodeId(hub.label, arc.step);
    const step = steps.get(arc.step);
    if (!copies.has(copy))
      copies.set(copy, {
        id: copy,
        kind: "copy",
        index: hub.index,
        label: hub.label,
        description: `${hub.description}, drawn beside step ${step?.label ?? arc.step}`,
        linkageClass: step?.linkageClass ?? null,
      });
    const [source, target] = arc.source === hub.id ? [copy, arc.target] : [arc.source, copy];
    arcs.push({ ...arc, id: `${source} → ${target}`, source, target });
  }
  return { nodes: [...nodes, ...copies.values()], arcs };
}

/** Only the given steps, their arcs and the species (or copies) those arcs reach: a focused neighbourhood on its own. */
export function onlySteps(model: SpeciesStepModel, steps: ReadonlySet<number>): SpeciesStepModel {
  const arcs = model.arcs.filter((arc) => steps.has(arc.step));
  const reached = new Set(arcs.flatMap(({ source, target }) => [source, target]));
  return { nodes: model.nodes.filter((node) => reached.has(node.id)), arcs };
}

/** Every node that stands for a species: the species itself, or its copies. */
export function speciesNodeIds(model: SpeciesStepModel): Map<number, string[]> {
  const ids = new Map<number, string[]>();
  for (const node of model.nodes) if (node.kind !== "step") ids.set(node.index, [...(ids.get(node.index) ?? []), node.id]);
  return ids;
}

/** Ticks of the force simulation: enough for 500 steps to settle, few enough for a worker to finish in seconds. */
const ticks = 240;
const margin = 10;
/** Room around each linkage class's anchor, per node of the class (px²). */
const areaPerStep = 150 * 150;

/**
 * Top-left corners from a force layout (d3-force): arcs pull a step toward its species, every node
 * pushes the others away, and no two nodes' discs (each wide enough for its box and label) overlap.
 * Each linkage class has an anchor its steps are drawn to: the largest class in the middle, the
 * others spiralling out by size, so classes sit apart and species shared by several lie between
 * them. A layered layout (dagre, elkjs) took seconds at 60 steps and minutes at 500 on these dense
 * bipartite graphs (tests/bench/graph-layout.ts). d3-force starts from the anchors and draws from
 * its own seeded generator, so the same model always gets the same picture.
 */
export function layoutSpeciesSteps(model: SpeciesStepModel): Record<string, XY> {
  // Hubs' copies take no part in the force: each is set down beside its step afterwards, so a hub
  // pulls nothing together.
  const copies = model.nodes.filter((node) => node.kind === "copy");
  const nodes = copies.length > 0 ? model.nodes.filter((node) => node.kind !== "copy") : model.nodes;
  const anchors = classAnchors(model);
  const bodies: Body[] = nodes.map((node) => ({ id: node.id, size: estimateSpeciesStepSize(node), radius: bodyRadius(node), anchor: anchors.get(node.linkageClass ?? -1) }));
  const byId = new Map(bodies.map((body) => [body.id, body]));
  const arcs = model.arcs.filter(({ source, target }) => byId.has(source) && byId.has(target));
  // A species starts amid the anchors of its steps, a step at its class's anchor: the force then has little to untangle.
  const near = new Map<string, XY[]>();
  for (const { source, target } of arcs)
    for (const [one, other] of [
      [source, target],
      [target, source],
    ]) {
      const anchor = byId.get(other)?.anchor;
      if (anchor) near.set(one, [...(near.get(one) ?? []), anchor]);
    }
  bodies.forEach((body, index) => {
    const around = body.anchor ? [body.anchor] : (near.get(body.id) ?? [{ x: 0, y: 0 }]);
    // A small spiral about the start keeps nodes that start together apart.
    const turn = index * 2.39996;
    body.x = around.reduce((sum, { x }) => sum + x, 0) / around.length + Math.cos(turn) * Math.sqrt(index) * 4;
    body.y = around.reduce((sum, { y }) => sum + y, 0) / around.length + Math.sin(turn) * Math.sqrt(index) * 4;
  });
  const links = arcs.map(({ source, target }) => ({ source, target }));
  forceSimulation(bodies)
    .force("arcs", forceLink<Body, SimulationLinkDatum<Body>>(links).id(({ id }) => id).distance(64).strength(0.4))
    .force("spread", forceManyBody<Body>().strength(-160).distanceMax(500))
    .force("apart", forceCollide<Body>(({ radius }) => radius).iterations(2))
    // Steps keep to their class's anchor; species, free of any class, only drift gently to the middle.
    .force("x", forceX<Body>(({ anchor }) => anchor?.x ?? 0).strength(({ anchor }) => (anchor ? 0.12 : 0.01)))
    .force("y", forceY<Body>(({ anchor }) => anchor?.y ?? 0).strength(({ anchor }) => (anchor ? 0.12 : 0.01)))
    .stop()
    .tick(ticks);
  const placed: Record<string, XY> = Object.fromEntries(bodies.map(({ id, x = 0, y = 0, size }) => [id, { x: Math.round(x - size.width / 2), y: Math.round(y - size.height / 2) }]));
  return copies.length > 0 ? placeCopies(copies, nodes, placed) : placed;
}

/** Free space kept around a copy (px). */
const copyGap = 4;
/** Directions tried around a step, left, above and below first: its label runs to the right. */
const copyDirections = [180, 135, 225, 90, 270, 45, 315, 0, 157.5, 202.5, 112.5, 247.5, 67.5, 292.5, 22.5, 337.5].map((degrees) => (degrees * Math.PI) / 180);

/**
 * Each copy in the first free place on rings round its step's square, nearest ring first; a step's
 * label counts as taken space. Boxes are found through a coarse grid, so this stays linear.
 */
function placeCopies(copies: SpeciesStepNodeModel[], nodes: SpeciesStepNodeModel[], placed: Record<string, XY>): Record<string, XY> {
  const taken = new BoxGrid(80);
  for (const node of nodes) {
    const { width, height } = estimateSpeciesStepSize(node);
    const labelled = node.kind === "step" ? width + node.label.length * 7 + 4 : width;
    taken.add({ ...placed[node.id], width: labelled, height });
  }
  const result = { ...placed };
  for (const copy of copies) {
    const step = placed[stepNodeId(Number(copy.id.slice(copy.id.lastIndexOf("@") + 1)))] ?? { x: 0, y: 0 };
    const size = estimateSpeciesStepSize(copy);
    const centre = { x: step.x + 7, y: step.y + 7 };
    let at: XY | null = null;
    for (let ring = 0; !at; ring++) {
      const distance = 22 + size.width / 2 + ring * 12;
      for (const angle of copyDirections) {
        const box = { x: Math.round(centre.x + Math.cos(angle) * distance - size.width / 2), y: Math.round(centre.y + Math.sin(angle) * distance - size.height / 2), ...size };
        if (!taken.hits(box, copyGap)) {
          at = { x: box.x, y: box.y };
          taken.add(box);
          break;
        }
      }
    }
    result[copy.id] = at;
  }
  return result;
}

type Box = XY & Size;

/** Boxes bucketed by the grid cells they cover, for "does this box hit any" without a scan of all. */
class BoxGrid {
  private cells = new Map<string, Box[]>();
  constructor(private readonly cell: number) {}

  add(box: Box) {
    for (const key of this.keys(box, 0)) this.cells.set(key, [...(this.cells.get(key) ?? []), box]);
  }

  hits(box: Box, gap: number): boolean {
    for (const key of this.keys(box, gap))
      for (const other of this.cells.get(key) ?? [])
        if (box.x - gap < other.x + other.width && other.x < box.x + box.width + gap && box.y - gap < other.y + other.height && other.y < box.y + box.height + gap) return true;
    return false;
  }

  private *keys(box: Box, gap: number) {
    for (let i = Math.floor((box.x - gap) / this.cell); i <= Math.floor((box.x + box.width + gap) / this.cell); i++)
      for (let j = Math.floor((box.y - gap) / this.cell); j <= Math.floor((box.y + box.height + gap) / this.cell); j++) yield `${i},${j}`;
  }
}

/** The linkage class with the most steps: the view opens on it. */
export function largestClass(model: SpeciesStepModel): number | null {
  const counts = stepCounts(model);
  return [...counts].reduce<[number | null, number]>(([best, most], [linkageClass, count]) => (count > most ? [linkageClass, count] : [best, most]), [null, 0])[0];
}

function stepCounts(model: SpeciesStepModel): Map<number, number> {
  const counts = new Map<number, number>();
  for (const { kind, linkageClass } of model.nodes) if (kind === "step" && linkageClass !== null) counts.set(linkageClass, (counts.get(linkageClass) ?? 0) + 1);
  return counts;
}

/**
 * An anchor per linkage class on a spiral out from the middle, largest class first, each given
 * room in proportion to its steps (Vogel's sunflower spiral: even spacing without a grid).
 */
function classAnchors(model: SpeciesStepModel): Map<number, XY> {
  const bySize = [...stepCounts(model)].sort(([a, countA], [b, countB]) => countB - countA || a - b);
  const anchors = new Map<number, XY>();
  let area = 0;
  bySize.forEach(([linkageClass, count], order) => {
    // The anchor sits at the radius that encloses the area of every class before it plus half its own.
    const radius = Math.sqrt((area + (count * areaPerStep) / 2) / Math.PI);
    area += count * areaPerStep;
    const angle = order * 2.39996;
    anchors.set(linkageClass, { x: Math.round(Math.cos(angle) * radius), y: Math.round(Math.sin(angle) * radius) });
  });
  return anchors;
}

interface Body extends SimulationNodeDatum {
  id: string;
  size: Size;
  radius: number;
  /** Where a step's linkage class gathers; none for a species. */
  anchor?: XY;
}

/** Half the box's diagonal; a step's label (about 8 px a character) sits beside its square. */
function bodyRadius(node: SpeciesStepNodeModel): number {
  const { width, height } = estimateSpeciesStepSize(node);
  const labelled = node.kind === "step" ? width + node.label.length * 7 + 4 : width;
  return Math.hypot(labelled, height) / 2 + margin;
}
