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
    used.has(index) ? [{ id: speciesNodeId(name), kind: "species" as const, index, label: name, description: `Species ${name}` }] : [],
  );
  const arcs: ArcModel[] = [];
  steps.forEach(({ label, line, reactants, products, reactions }, index) => {
    const name = label ?? `line ${line}`;
    const directions = new Set(reactions.map((reaction) => report.reactions[reaction]).map((each) => (each ? `${each.from}>${each.to}` : "")));
    const twoWay = directions.size > 1;
    nodes.push({ id: stepNodeId(index), kind: "step", index, label: name, description: `Step ${name}${twoWay ? ", reversible" : ""}` });
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

/**
 * Top-left corners from a force layout (d3-force): arcs pull a step toward its species, every node
 * pushes the others away, and no two nodes' discs (each wide enough for its box and label) overlap.
 * A layered layout (dagre, elkjs) took seconds at 60 steps and minutes at 500 on these dense
 * bipartite graphs (tests/bench/graph-layout.ts). d3-force starts from a fixed spiral and draws
 * from its own seeded generator, so the same model always gets the same picture.
 */
export function layoutSpeciesSteps(model: SpeciesStepModel): Record<string, XY> {
  const bodies: Body[] = model.nodes.map((node) => ({ id: node.id, size: estimateSpeciesStepSize(node), radius: bodyRadius(node) }));
  const links = model.arcs.map(({ source, target }) => ({ source, target }));
  forceSimulation(bodies)
    .force("arcs", forceLink<Body, SimulationLinkDatum<Body>>(links).id(({ id }) => id).distance(56))
    .force("spread", forceManyBody<Body>().strength(-140).distanceMax(600))
    .force("apart", forceCollide<Body>(({ radius }) => radius).iterations(2))
    // A gentle pull to the middle keeps parts that share no species from drifting off.
    .force("x", forceX<Body>(0).strength(0.03))
    .force("y", forceY<Body>(0).strength(0.05))
    .stop()
    .tick(ticks);
  return Object.fromEntries(bodies.map(({ id, x = 0, y = 0, size }) => [id, { x: Math.round(x - size.width / 2), y: Math.round(y - size.height / 2) }]));
}

interface Body extends SimulationNodeDatum {
  id: string;
  size: Size;
  radius: number;
}

/** Half the box's diagonal; a step's label (about 8 px a character) sits beside its square. */
function bodyRadius(node: SpeciesStepNodeModel): number {
  const { width, height } = estimateSpeciesStepSize(node);
  const labelled = node.kind === "step" ? width + node.label.length * 7 + 4 : width;
  return Math.hypot(labelled, height) / 2 + margin;
}
