// Structure benchmark: analyzeSource (parse included) on generated mechanisms from 100 to 5,000
// reactions, 2,000 species at the top, and random networks without locality. Targets from PRODUCT.md: the largest under 500 ms, a
// 100-step mechanism under 5 ms. Run: npx tsx tests/bench/structure.ts
import { analyzeSource } from "~/chem/analysis";
import { loadSolver } from "~/chem/conservation";
import { seededRandom } from "~/chem/seeded-random";

/**
 * A mechanism shaped like real ones: species take part in steps with nearby species (a pathway,
 * a homologous series), uni- and bimolecular steps, a share of them reversible, named and literal
 * rate coefficients. `reactions` counts directed reactions (a reversible step gives two).
 */
export function generatedMechanism(reactions: number, species: number, { seed = 1, reversibleShare = 0.35, reach = 12 } = {}): string {
  const next = seededRandom(seed);
  // `reach` = species: no locality at all, every species reacts with any other.
  const pick = (centre: number) => `S${1 + ((centre + Math.floor(next() * reach) + species) % species)}`;
  const lines: string[] = [];
  let count = 0;
  let parameters = 0;
  while (count < reactions) {
    const centre = Math.floor(next() * species);
    const shape = next();
    const left = shape < 0.3 ? pick(centre) : `${pick(centre)} + ${pick(centre)}`;
    const right = shape < 0.5 ? `${pick(centre)} + ${pick(centre)}` : shape < 0.8 ? pick(centre) : `2${pick(centre)}`;
    if (left.replace(/\s/g, "") === right.replace(/\s/g, "")) continue;
    const reversible = count + 2 <= reactions && next() < reversibleShare;
    const rate = () => (next() < 0.5 ? `k${++parameters} = ${(next() * 10).toPrecision(3)}` : (next() * 10).toPrecision(3));
    lines.push(`${left} ${reversible ? "<=>" : "->"} ${right} @ ${reversible ? `${rate()}, ${rate()}` : rate()}`);
    count += reversible ? 2 : 1;
  }
  return lines.join("\n") + "\n";
}

interface Timing {
  wallMs: number;
  /** CPU time of this process: less disturbed than wall time on a machine shared with others. */
  cpuMs: number;
  report: Awaited<ReturnType<typeof analyzeSource>>;
}

async function median(source: string, runs: number): Promise<Timing> {
  let report = await analyzeSource(source);
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let run = 0; run < runs; run++) {
    const start = performance.now();
    const startCpu = process.cpuUsage();
    report = await analyzeSource(source);
    const used = process.cpuUsage(startCpu);
    wall.push(performance.now() - start);
    cpu.push((used.user + used.system) / 1000);
  }
  const middle = (values: number[]) => values.sort((a, b) => a - b)[Math.floor(values.length / 2)];
  return { wallMs: middle(wall), cpuMs: middle(cpu), report };
}

function row(label: string, { wallMs, cpuMs, report }: Timing, growth: string): string {
  return (
    `${label.padStart(9)}  ${String(report.species.length).padStart(7)}  ${String(report.complexes.length).padStart(9)}` +
    `  ${String(report.rank).padStart(4)}  ${String(report.deficiency).padStart(10)}  ${wallMs.toFixed(1).padStart(8)}  ${cpuMs.toFixed(1).padStart(7)}  ${growth.padStart(6)}`
  );
}

async function main() {
  await loadSolver();
  const sizes = [100, 250, 500, 1000, 2500, 5000];
  console.log("reactions  species  complexes  rank  deficiency   wall ms   cpu ms  growth");
  let previous: { reactions: number; ms: number } | null = null;
  let largest: Timing | null = null;
  for (const reactions of sizes) {
    const timing = await median(generatedMechanism(reactions, Math.round((reactions * 2) / 5)), reactions >= 2500 ? 7 : 15);
    // Growth exponent: how wall time scales with size between neighbouring rows (1 = linear).
    const growth = previous ? (Math.log(timing.wallMs / previous.ms) / Math.log(reactions / previous.reactions)).toFixed(2) : "";
    console.log(row(String(reactions), timing, growth));
    previous = { reactions, ms: timing.wallMs };
    largest = timing;
  }
  const reversible = await median(generatedMechanism(5000, 2000, { reversibleShare: 1 }), 5);
  console.log(row("5000 rev", reversible, ""), ` (every step reversible: detailed balance, ${reversible.report.detailedBalance.spanningForestConditions.length + reversible.report.detailedBalance.circuitConditions.length} conditions)`);

  // Species reacting at random, with no locality: the worst fill-in for exact elimination.
  for (const [reactions, species] of [
    [2500, 1000],
    [5000, 2000],
  ]) {
    const random = await median(generatedMechanism(reactions, species, { reach: species }), 5);
    console.log(row(`${reactions} rnd`, random, ""), " (species react at random)");
  }

  const hundredSteps = generatedMechanism(100, 40, { seed: 7 }).split("\n").slice(0, 100).join("\n");
  const small = await median(hundredSteps, 101);
  console.log(`\n5,000 reactions / 2,000 species: ${largest!.wallMs.toFixed(1)} ms wall = ${(largest!.wallMs / 500).toFixed(2)} × the 500 ms target`);
  console.log(`100-step mechanism:             ${small.wallMs.toFixed(2)} ms wall = ${(small.wallMs / 5).toFixed(2)} × the 5 ms target`);
}

if (process.argv[1]?.endsWith("structure.ts")) main();
