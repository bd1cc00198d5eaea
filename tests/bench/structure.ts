// Structure benchmark: analyzeSource (parse included) on generated mechanisms from 100 to 5,000
// reactions, 2,000 species at the top. Targets from PRODUCT.md: the largest under 500 ms, a
// 100-step mechanism under 5 ms. Run: npx tsx tests/bench/structure.ts
import { analyzeSource } from "~/chem/analysis";
import { loadSolver } from "~/chem/conservation";

/** Small deterministic generator so every run measures the same networks. */
function random(seed: number): () => number {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A mechanism shaped like real ones: species take part in steps with nearby species (a pathway,
 * a homologous series), uni- and bimolecular steps, about a third reversible, named and literal
 * rate coefficients. `reactions` counts directed reactions (a reversible step gives two).
 */
export function generatedMechanism(reactions: number, species: number, seed = 1): string {
  const next = random(seed);
  const pick = (centre: number) => `S${1 + ((centre + Math.floor(next() * 12) + species) % species)}`;
  const lines: string[] = [];
  let count = 0;
  let parameters = 0;
  while (count < reactions) {
    const centre = Math.floor(next() * species);
    const shape = next();
    const left = shape < 0.3 ? pick(centre) : `${pick(centre)} + ${pick(centre)}`;
    const right = shape < 0.5 ? `${pick(centre)} + ${pick(centre)}` : shape < 0.8 ? pick(centre) : `2${pick(centre)}`;
    if (left.replace(/\s/g, "") === right.replace(/\s/g, "")) continue;
    const reversible = count + 2 <= reactions && next() < 0.35;
    const rate = () => (next() < 0.5 ? `k${++parameters} = ${(next() * 10).toPrecision(3)}` : (next() * 10).toPrecision(3));
    lines.push(`${left} ${reversible ? "<=>" : "->"} ${right} @ ${reversible ? `${rate()}, ${rate()}` : rate()}`);
    count += reversible ? 2 : 1;
  }
  return lines.join("\n") + "\n";
}

async function medianMs(source: string, runs: number): Promise<{ ms: number; report: Awaited<ReturnType<typeof analyzeSource>> }> {
  const times: number[] = [];
  let report = await analyzeSource(source);
  for (let run = 0; run < runs; run++) {
    const start = performance.now();
    report = await analyzeSource(source);
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return { ms: times[Math.floor(times.length / 2)], report };
}

async function main() {
  await loadSolver();
  const sizes = [100, 250, 500, 1000, 2500, 5000];
  console.log("reactions  species  complexes  rank  deficiency   median ms  growth");
  let previous: { reactions: number; ms: number } | null = null;
  let largest = 0;
  for (const reactions of sizes) {
    const species = Math.round((reactions * 2) / 5);
    const { ms, report } = await medianMs(generatedMechanism(reactions, species), reactions >= 2500 ? 5 : 11);
    const growth = previous ? (Math.log(ms / previous.ms) / Math.log(reactions / previous.reactions)).toFixed(2) : "";
    console.log(
      `${String(reactions).padStart(9)}  ${String(report.species.length).padStart(7)}  ${String(report.complexes.length).padStart(9)}` +
        `  ${String(report.rank).padStart(4)}  ${String(report.deficiency).padStart(10)}  ${ms.toFixed(1).padStart(10)}  ${growth.padStart(6)}`,
    );
    previous = { reactions, ms };
    largest = ms;
  }
  const hundredSteps = generatedMechanism(100, 40, 7).split("\n").slice(0, 100).join("\n");
  const small = await medianMs(hundredSteps, 51);
  console.log(`\n5,000 reactions / 2,000 species: ${largest.toFixed(1)} ms = ${(largest / 500).toFixed(2)} × the 500 ms target`);
  console.log(`100-step mechanism:             ${small.ms.toFixed(2)} ms = ${(small.ms / 5).toFixed(2)} × the 5 ms target`);
}

if (process.argv[1]?.endsWith("structure.ts")) main();
