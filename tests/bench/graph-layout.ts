// Graph layout benchmark: the present dagre placement (every linkage class laid out, then shelved)
// against elkjs's layered layout of the same classes, on the 64-step cell and generated mechanisms
// of 60 and 500 steps: time, overlapping node pairs and the picture's size.
// Then the species–step view's force layout at 500 steps, hub species drawn once against drawn as
// copies beside their steps (the default) and left out.
// Run: npx tsx tests/bench/graph-layout.ts [species-steps]   (the argument runs only the second part)
import { readFileSync } from "node:fs";
import ELK, { type ElkNode } from "elkjs/lib/elk.bundled.js";
import { analyzeSource } from "~/chem/analysis";
import { complexLabel } from "~/components/graph/graph-model";
import { estimateNodeSize, placeComplexes, type Size, type XY } from "~/components/graph/layout";
import { packInRows } from "~/components/graph/shelf-packing";
import { buildSpeciesStepModel, defaultHubChoice, type HubDrawing, hubSpecies, layoutSpeciesSteps, withHubs } from "~/components/graph/species-step-model";
import { generatedOxidation } from "../fixtures/generated-oxidation";

type Report = Awaited<ReturnType<typeof analyzeSource>>;
const sizeOf = (key: string) => estimateNodeSize(complexLabel(key));

function dagrePlacement(report: Report): Record<string, XY> {
  return placeComplexes({ keys: report.complexes, reactions: report.reactions, linkageClasses: report.linkageClasses, known: {}, sizeOf });
}

async function elkPlacement(report: Report): Promise<Record<string, XY>> {
  const elk = new ELK();
  const keys = report.complexes;
  const classes = await Promise.all(
    report.linkageClasses.map(async (members) => {
      const inClass = new Set(members);
      const graph: ElkNode = await elk.layout({
        id: "root",
        layoutOptions: { "elk.algorithm": "layered", "elk.direction": "RIGHT", "elk.spacing.nodeNode": "28", "elk.layered.spacing.nodeNodeBetweenLayers": "72" },
        children: members.map((index) => ({ id: String(index), ...sizeOf(keys[index]) })),
        edges: report.reactions
          .filter(({ from, to }) => inClass.has(from) && inClass.has(to))
          .map(({ from, to }, k) => ({ id: `e${k}`, sources: [String(from)], targets: [String(to)] })),
      });
      const corners = Object.fromEntries((graph.children ?? []).map(({ id, x = 0, y = 0 }) => [keys[Number(id)], { x, y }]));
      return { corners, size: { width: graph.width ?? 0, height: graph.height ?? 0 } };
    }),
  );
  const offsets = packInRows(classes.map(({ size }) => size), 56);
  const placed: Record<string, XY> = {};
  classes.forEach(({ corners }, index) => {
    for (const [key, at] of Object.entries(corners)) placed[key] = { x: offsets[index].x + at.x, y: offsets[index].y + at.y };
  });
  return placed;
}

function overlaps(placed: Record<string, XY>): number {
  const boxes = Object.entries(placed).map(([key, at]): XY & Size => ({ ...at, ...sizeOf(key) }));
  let count = 0;
  for (let i = 0; i < boxes.length; i++)
    for (let j = i + 1; j < boxes.length; j++) {
      const [a, b] = [boxes[i], boxes[j]];
      if (a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height) count++;
    }
  return count;
}

function extent(placed: Record<string, XY>): Size {
  const entries = Object.entries(placed);
  const width = Math.max(...entries.map(([key, { x }]) => x + sizeOf(key).width)) - Math.min(...entries.map(([, { x }]) => x));
  const height = Math.max(...entries.map(([key, { y }]) => y + sizeOf(key).height)) - Math.min(...entries.map(([, { y }]) => y));
  return { width: Math.round(width), height: Math.round(height) };
}

async function timed<T>(run: () => T | Promise<T>): Promise<{ ms: number; result: T }> {
  await run(); // warm-up
  const runs: number[] = [];
  let result!: T;
  for (let i = 0; i < 5; i++) {
    const start = performance.now();
    result = await run();
    runs.push(performance.now() - start);
  }
  return { ms: runs.sort((a, b) => a - b)[2], result };
}

const cases: [string, string][] = [
  ["oxidation cell, 64 steps", readFileSync("tests/fixtures/oxidation-cell.weave", "utf8")],
  ["generated, 60 steps", generatedOxidation(60)],
  ["generated, 500 steps", generatedOxidation(500)],
];
const onlySpeciesSteps = process.argv[2] === "species-steps";
for (const [name, source] of onlySpeciesSteps ? [] : cases) {
  const report = await analyzeSource(source);
  console.log(`${name}: ${report.complexes.length} complexes, ${report.linkageClasses.length} linkage classes`);
  for (const [engine, run] of [
    ["dagre", () => dagrePlacement(report)],
    ["elkjs", () => elkPlacement(report)],
  ] as const) {
    const { ms, result } = await timed(run);
    const { width, height } = extent(result);
    console.log(`  ${engine.padEnd(6)} ${ms.toFixed(1).padStart(7)} ms  overlaps ${overlaps(result)}  picture ${width} × ${height} px`);
  }
}

const speciesSteps = buildSpeciesStepModel(await analyzeSource(generatedOxidation(500)));
const hubs = new Set(hubSpecies(speciesSteps, defaultHubChoice.threshold));
console.log(`species–step view, generated 500 steps: ${speciesSteps.nodes.length} nodes, hubs (≥ ${defaultHubChoice.threshold} steps) ${hubs.size}`);
for (const drawing of ["once", "copies", "hidden"] satisfies HubDrawing[]) {
  const model = withHubs(speciesSteps, hubs, drawing);
  const { ms } = await timed(() => layoutSpeciesSteps(model));
  console.log(`  hubs ${drawing.padEnd(6)} ${ms.toFixed(1).padStart(7)} ms  ${model.nodes.length} nodes, ${model.arcs.length} arcs`);
}
