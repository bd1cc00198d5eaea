// Dynamics benchmark: our integrators against the targets in the dynamics issue and, side by
// side in the same run, against odex (explicit, non-stiff) and scipy's LSODA (scipy-peer.ts), warm
// in one process. The cold, command-line comparison is lsoda.ts. Run: npx tsx tests/bench/dynamics.ts
import { createRequire } from "node:module";
import { networkSpec } from "~/chem/kinetics/from-network";
import { polynomialSpec } from "~/chem/kinetics/from-polynomial";
import { compileKineticSystem, type KineticSpec } from "~/chem/kinetics/kinetic-system";
import type { Method } from "~/chem/kinetics/integrator";
import { simulateSystem } from "~/chem/kinetics/simulate";
import { scipyPeer, type PeerFigures } from "./scipy-peer";
import { brusselator, generatedNetwork, lorenz, robertson } from "../fixtures/dynamics/models";

// odex is CommonJS marked __esModule: tsx's ESM interop hides its named exports, require does not.
// The package file itself: tsconfig maps the bare name "odex" to our declaration for type checks.
const { Solver } = createRequire(import.meta.url)("odex/src/odex.js") as typeof import("odex");

interface Problem {
  name: string;
  spec: KineticSpec;
  until: number;
  rtol: number;
  atol: number;
  method: Method;
}

type Figures = PeerFigures;

const problems: Problem[] = [
  { name: "Robertson to t = 1e11", spec: networkSpec(robertson().mechanism, robertson().network), until: 1e11, rtol: 1e-6, atol: 1e-10, method: "auto" },
  { name: "generated 200 species, t = 100", spec: generatedSpec(200), until: 100, rtol: 1e-6, atol: 1e-10, method: "auto" },
  { name: "pathway 1,000 species, t = 100", spec: generatedSpec(1000, 6), until: 100, rtol: 1e-6, atol: 1e-10, method: "auto" },
  { name: "Brusselator (non-stiff), t = 20", spec: polynomialSpec(brusselator()), until: 20, rtol: 1e-8, atol: 1e-10, method: "explicit" },
  { name: "Lorenz (non-stiff), t = 20", spec: polynomialSpec(lorenz()), until: 20, rtol: 1e-8, atol: 1e-10, method: "explicit" },
];

function generatedSpec(size: number, reach?: number): KineticSpec {
  const { mechanism, network } = generatedNetwork(size, { reach });
  return networkSpec(mechanism, network);
}

/**
 * Best of `runs` timed runs after two warm-up runs: the machine is shared, and the minimum is the
 * figure least disturbed by other load. The Python peer is timed the same way.
 */
function best<T>(runs: number, run: () => { ms: number; value: T }): { ms: number; value: T } {
  run();
  run();
  return Array.from({ length: runs }, run).reduce((a, b) => (b.ms < a.ms ? b : a));
}

function ours(problem: Problem): Figures {
  const { ms, value } = best(9, () => {
    const system = compileKineticSystem(problem.spec);
    const result = simulateSystem(system, { until: problem.until, samples: 2, rtol: problem.rtol, atol: problem.atol, method: problem.method });
    return { ms: result.stats.ms, value: result };
  });
  return { ms, steps: value.stats.steps, jacobians: value.stats.jacobians, final: problem.spec.names.map((name) => value.series[name][1]) };
}

function odex(problem: Problem): Figures {
  const system = compileKineticSystem(problem.spec);
  const n = problem.spec.names.length;
  const y = new Float64Array(n);
  const dy = new Float64Array(n);
  const f = (_t: number, state: number[]) => {
    y.set(state);
    system.rhs(y, dy);
    return Array.from(dy);
  };
  const { ms, value } = best(9, () => {
    const solver = new Solver(n);
    solver.relativeTolerance = problem.rtol;
    solver.absoluteTolerance = problem.atol;
    solver.maxSteps = 1e6;
    const start = performance.now();
    const result = solver.solve(f, 0, [...problem.spec.initial], problem.until);
    return { ms: performance.now() - start, value: result };
  });
  return { ms, steps: value.nStep, jacobians: 0, final: value.y };
}

function lsoda(list: Problem[]): Figures[] | null {
  // LSODA factors densely: the 1,000-species run takes seconds.
  return scipyPeer(list, "lsoda", (problem) => (problem.spec.names.length < 500 ? 7 : 2));
}

/** Largest relative difference between two final states, relative to the state's size. */
function disagreement(a: number[], b: number[]): number {
  const scale = Math.max(...a.map(Math.abs), 1e-300);
  return Math.max(...a.map((x, i) => Math.abs(x - b[i]))) / scale;
}

function row(cells: (string | number)[]): string {
  const widths = [34, 10, 8, 11, 11, 8, 7, 12, 10];
  return cells.map((cell, i) => (i === 0 ? String(cell).padEnd(widths[i]) : String(cell).padStart(widths[i]))).join("");
}

function main() {
  const peers = lsoda(problems);
  console.log(row(["problem", "ours ms", "steps", "Jacobians", "LSODA ms", "steps", "Jac.", "LSODA/ours", "max diff"]));
  const mine = problems.map((problem, i) => {
    const figures = ours(problem);
    const peer = peers?.[i];
    console.log(
      row([
        problem.name,
        figures.ms.toFixed(2),
        figures.steps,
        figures.jacobians,
        peer ? peer.ms.toFixed(2) : "–",
        peer ? peer.steps : "–",
        peer ? peer.jacobians : "–",
        peer ? (peer.ms / figures.ms).toFixed(2) : "–",
        peer ? disagreement(figures.final, peer.final).toExponential(1) : "–",
      ]),
    );
    return figures;
  });

  console.log("\nnon-stiff problems against odex (Gragg–Bulirsch–Stoer extrapolation), same tolerances:");
  problems.forEach((problem, i) => {
    if (problem.method !== "explicit") return;
    const peer = odex(problem);
    console.log(
      `  ${problem.name.padEnd(34)} ours ${mine[i].ms.toFixed(2)} ms, odex ${peer.ms.toFixed(2)} ms: odex/ours = ${(peer.ms / mine[i].ms).toFixed(2)}` +
        `  (max diff ${disagreement(mine[i].final, peer.final).toExponential(1)})`,
    );
  });

  const [stiff, large] = mine;
  console.log("\ntargets:");
  console.log(`  Robertson to 1e11: ${stiff.steps} steps (< 1,000) in ${stiff.ms.toFixed(2)} ms (< 50 ms)`);
  console.log(`  generated 200 species to t = 100: ${large.ms.toFixed(1)} ms (< 1,000 ms) = ${(large.ms / 1000).toFixed(2)} × target`);
}

main();
