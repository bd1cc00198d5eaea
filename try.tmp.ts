import { simulateNetwork } from "~/chem/kinetics/simulate";
import { robertson } from "/work/wt-bdf/tests/fixtures/dynamics/models";
const { mechanism, network } = robertson();
for (const samples of [2, 500]) for (const method of ["bdf", "rodas4"] as const) {
  const run = simulateNetwork(mechanism, network, { until: 1e11, samples, rtol: 1e-3, atol: 1e-6, method });
  let worst = 0, at = 0;
  for (let i = 0; i < run.t.length; i++) { const d = Math.abs(run.series.A[i] + run.series.B[i] + run.series.C[i] - 1); if (d > worst) { worst = d; at = i; } }
  console.log(samples, method, worst, run.t[at], run.series.A[at], run.series.B[at], run.series.C[at], JSON.stringify(run.stats));
}
