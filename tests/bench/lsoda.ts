// Cold-start benchmark against scipy's LSODA, as users and scripts run us: each of our runs is a
// fresh `mechweave simulate` process from the CLI bundle (built first; compute time from its
// stats.ms, so the first simulation pays for compilation and JIT warm-up), against LSODA (`odeint`
// with a vectorised right-hand side and analytic Jacobian, best of 7 in one process) and SUNDIALS
// CVODE (C, dense LU, best of 7) at the same rtol and atol. Accuracy of all against scipy's Radau
// at rtol 1e-10. Target: ours/LSODA ≤ 1.0 on each problem (goal 0.5).
// Run: npx tsx tests/bench/lsoda.ts [runs]
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { networkSpec } from "~/chem/kinetics/from-network";
import type { Mechanism, Network } from "~/chem/model";
import { aggregation, generatedNetwork, robertson } from "../fixtures/dynamics/models";
import { cvodePeer } from "./cvode-peer";
import { scipyPeer, type PeerProblem } from "./scipy-peer";

const RTOL = 1e-6;
const ATOL = 1e-10;
const REFERENCE_RTOL = 1e-10;

interface Problem extends PeerProblem {
  name: string;
  text: string;
  /** Weights of a conserved total (Robertson's A + B + C), checked to 1e-10. */
  conserved?: number[];
}

function problem(name: string, model: { mechanism: Mechanism; network: Network }, until: number): Problem {
  return { name, text: weaveText(model), spec: networkSpec(model.mechanism, model.network), until, rtol: RTOL, atol: ATOL };
}

/** The model as a mechanism file: one line per reaction, then the initial concentrations. */
function weaveText({ mechanism, network }: { mechanism: Mechanism; network: Network }): string {
  const side = (complex: number) => network.complexes[complex].text;
  const reactions = network.reactions.map((r) => `${side(r.from)} -> ${side(r.to)} @ ${r.rate}`);
  const initial = Object.entries(mechanism.initial).map(([name, value]) => `[${name}]0 = ${value}`);
  return [...reactions, ...initial].join("\n") + "\n";
}

const problems = [
  { ...problem("Robertson to t = 1e11", robertson(), 1e11), conserved: [1, 1, 1] },
  problem("aggregation, 200 species, t = 1e4", aggregation(200), 1e4),
  problem("random 200 species, 5 decades, t = 100", generatedNetwork(200, { decades: 5 }), 100),
];

interface Run {
  ms: number;
  steps: number;
  factorizations: number;
  method: string;
  final: number[];
}

function cli(file: string, p: Problem): Run {
  const args = ["build/mechweave-cli.js", "simulate", file, "--until", String(p.until), "--samples", "2", "--rtol", String(p.rtol), "--atol", String(p.atol), "--json"];
  const run = spawnSync(process.execPath, args, { encoding: "utf8", maxBuffer: 64 << 20 });
  if (run.status !== 0) throw new Error(`mechweave simulate failed: ${run.stderr}`);
  const result = JSON.parse(run.stdout) as { series: Record<string, number[]>; stats: { ms: number; steps: number; factorizations: number; method: string } };
  return { ...result.stats, final: p.spec.names.map((name) => result.series[name][1]) };
}

/** Largest difference between two final states, relative to the reference state's size. */
function disagreement(reference: number[], b: number[]): number {
  const scale = Math.max(...reference.map(Math.abs), 1e-300);
  return Math.max(...reference.map((x, i) => Math.abs(x - b[i]))) / scale;
}

function main() {
  const runs = Number(process.argv[2] ?? 3);
  spawnSync(process.execPath, ["scripts/ensure-generated.mjs"], { stdio: "inherit" });
  spawnSync(process.execPath, ["scripts/bundle.mjs"], { stdio: "inherit" });
  const directory = mkdtempSync(join(tmpdir(), "mechweave-bench-"));
  try {
    const lsoda = scipyPeer(problems, "lsoda", () => 7);
    const cvode = cvodePeer(problems, () => 7);
    const peers = [["LSODA", lsoda], ["CVODE", cvode]] as const;
    const radau = scipyPeer(problems.map((p) => ({ ...p, rtol: REFERENCE_RTOL, atol: ATOL * 1e-4 })), "radau", () => 1);
    problems.forEach((p, i) => {
      const file = join(directory, `problem-${i}.weave`);
      writeFileSync(file, p.text);
      const ours = Array.from({ length: runs }, () => cli(file, p));
      const times = ours.map((r) => r.ms).sort((a, b) => a - b);
      const median = times[Math.floor(times.length / 2)];
      const [first] = ours;
      console.log(`${p.name}`);
      console.log(`  ours (${first.method}): median ${median.toFixed(1)} ms of ${runs} fresh processes, spread ${times[0].toFixed(1)}–${times.at(-1)!.toFixed(1)} ms; ${first.steps} steps, ${first.factorizations} LU`);
      if (lsoda) console.log(`  LSODA: ${lsoda[i].ms.toFixed(1)} ms; ${lsoda[i].steps} steps, ${lsoda[i].jacobians} Jacobians`);
      if (cvode) console.log(`  CVODE: ${cvode[i].ms.toFixed(1)} ms; ${cvode[i].steps} steps, ${cvode[i].jacobians} Jacobians`);
      for (const [name, peer] of peers) {
        if (!peer) continue;
        const ratio = (ms: number) => (ms / peer[i].ms).toFixed(2);
        console.log(`  ratio ours/${name}: median ${ratio(median)}, best ${ratio(times[0])}, worst ${ratio(times.at(-1)!)}`);
      }
      const lowest = Math.min(...first.final);
      const drift = p.conserved && Math.abs(p.conserved.reduce((sum, w, v) => sum + w * (first.final[v] - p.spec.initial[v]), 0));
      console.log(`  ours: lowest final value ${lowest.toExponential(1)}${drift === undefined ? "" : `, conserved total off by ${drift.toExponential(1)} (limit 1e-10)`}`);
      if (radau) {
        const reference = radau[i].final;
        const peer = peers
          .flatMap(([name, figures]) => (figures ? [`, ${name} ${disagreement(reference, figures[i].final).toExponential(1)}`] : []))
          .join("");
        console.log(`  max difference from Radau at rtol ${REFERENCE_RTOL}: ours ${disagreement(reference, first.final).toExponential(1)}${peer}`);
      }
    });
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}

main();
