// The species–step (bipartite) view of a mechanism: a node per species and a small node per step,
// an arc from each reactant to its step and from the step to each product, labelled only where the
// stoichiometric coefficient exceeds 1. Laid out by a force simulation in a worker; positions stay
// with the reader (the shared layout is the complex graph's).
import { forceCollide, forceLink, forceManyBody, forceSimulation, forceX, forceY, type SimulationLinkDatum, type SimulationNodeDatum } from "d3-force";
import type { ComplexGraphReport } from "./graph-model";
import type { Size, XY } from "./layout";

export interface SpeciesStepNodeModel {
  /** `species:NAME` or `step:INDEX`, never the same as a complex's key. */
  id: string;
  kind: "species" | "step";
  /** Index into the report's `species` or `steps`. */
  index: number;
  label: string;
  description: string;
  /** A step's linkage class (that of its complexes); null for a species, which may join several. */
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
  /** The step the arc belongs to. */
  step: number;
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
        description: `${into ? "Reactant" : "Product"} ${species[speciesIndex]} of step ${name}${amount ? `, coefficient ${amount}` : ""}`,
      });
    };
    for (const [speciesIndex, coefficient] of reactants) arc(speciesIndex, coefficient, true);
    for (const [speciesIndex, coefficient] of products) arc(speciesIndex, coefficient, false);
  });
  return { nodes, arcs };
}

/** Species boxes as the complex boxes; a step is a small square with its label beside it. */
export function estimateSpeciesStepSize(node: SpeciesStepNodeModel): Size {
  return node.kind === "species" ? { width: Math.max(44, Math.round(node.label.length * 8.4 + 26)), height: 34 } : { width: 14, height: 14 };
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
  const anchors = classAnchors(model);
  const bodies: Body[] = model.nodes.map((node) => ({ id: node.id, size: estimateSpeciesStepSize(node), radius: bodyRadius(node), anchor: anchors.get(node.linkageClass ?? -1) }));
  const byId = new Map(bodies.map((body) => [body.id, body]));
  // A species starts amid the anchors of its steps, a step at its class's anchor: the force then has little to untangle.
  const near = new Map<string, XY[]>();
  for (const { source, target } of model.arcs)
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
  const links = model.arcs.map(({ source, target }) => ({ source, target }));
  forceSimulation(bodies)
    .force("arcs", forceLink<Body, SimulationLinkDatum<Body>>(links).id(({ id }) => id).distance(64).strength(0.4))
    .force("spread", forceManyBody<Body>().strength(-160).distanceMax(500))
    .force("apart", forceCollide<Body>(({ radius }) => radius).iterations(2))
    // Steps keep to their class's anchor; species, free of any class, only drift gently to the middle.
    .force("x", forceX<Body>(({ anchor }) => anchor?.x ?? 0).strength(({ anchor }) => (anchor ? 0.12 : 0.01)))
    .force("y", forceY<Body>(({ anchor }) => anchor?.y ?? 0).strength(({ anchor }) => (anchor ? 0.12 : 0.01)))
    .stop()
    .tick(ticks);
  return Object.fromEntries(bodies.map(({ id, x = 0, y = 0, size }) => [id, { x: Math.round(x - size.width / 2), y: Math.round(y - size.height / 2) }]));
}

/** The linkage class with the most steps: the view opens on it. */
export function largestClass(model: SpeciesStepModel): number | null {
  const counts = stepCounts(model);
  return [...counts].reduce<[number | null, number]>(([best, most], [linkageClass, count]) => (count > most ? [linkageClass, count] : [best, most]), [null, 0])[0];
}

function stepCounts(model: SpeciesStepModel): Map<number, number> {
  const counts = new Map<number, number>();
  for (const { linkageClass } of model.nodes) if (linkageClass !== null) counts.set(linkageClass, (counts.get(linkageClass) ?? 0) + 1);
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
