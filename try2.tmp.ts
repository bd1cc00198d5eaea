import { simulateNetwork } from "~/chem/kinetics/simulate";
import { robertson } from "/work/wt-bdf/tests/fixtures/dynamics/models";
const { mechanism, network } = robertson();
const run = simulateNetwork(mechanism, network, { until: 1e11, samples: 500, rtol: 1e-3, atol: 1e-6 });
let worst = 0, at = 0;
for (let i = 0; i < run.t.length; i++) { const d = Math.abs(run.series.A[i] + run.series.B[i] + run.series.C[i] - 1); if (d > worst) { worst = d; at = i; } }
console.log(worst, at, run.t[at], run.switchedAt, JSON.stringify(run.stats));
