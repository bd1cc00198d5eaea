// The demo's methane oxidation over the Dynamics panel's whole default horizon (50 s), against
// scipy's Radau at rtol 1e-10 (the unit test compares with odex, an explicit code, only over the
// first 0.2 ms: beyond that its steps stay near the microsecond time scale). Each species at each
// checkpoint is compared relative to its own scale, its largest value over the checkpoints.
// Run: npx tsx tests/bench/methane-radau.ts (needs python3 with scipy).
import { networkSpec } from "~/chem/kinetics/from-network";
import { simulateNetwork } from "~/chem/kinetics/simulate";
import { buildNetwork } from "~/chem/network";
import { parseMechanismWithSettings } from "~/chem/parse";
import { methaneOxidation } from "../../server/seed/methane-oxidation";
import { scipyPeer } from "./scipy-peer";

const checkpoints = [1e-3, 0.1, 1, 10, 50];
const rtol = 1e-10;
const atol = 1e-24;

function main() {
  let worst = 0;
  for (const T of [1000, 1100, 1200]) {
    const { mechanism } = parseMechanismWithSettings(methaneOxidation.source, { parameters: { T }, initial: {} });
    const network = buildNetwork(mechanism);
    const spec = networkSpec(mechanism, network);
    const theirs = scipyPeer(checkpoints.map((until) => ({ spec, until, rtol, atol })), "radau", () => 1);
    if (!theirs) return;
    const ours = checkpoints.map((until) => simulateNetwork(mechanism, network, { until, samples: 2, rtol, atol, method: "stiff" }));
    const names = spec.names;
    const scale = names.map((_, j) => Math.max(...theirs.map((run) => Math.abs(run.final[j]))));
    let worstHere = { deviation: 0, where: "" };
    checkpoints.forEach((until, c) => {
      names.forEach((name, j) => {
        if (scale[j] === 0) return;
        const deviation = Math.abs(ours[c].series[name].at(-1)! - theirs[c].final[j]) / scale[j];
        if (deviation > worstHere.deviation) worstHere = { deviation, where: `${name} at t = ${until} s` };
      });
    });
    worst = Math.max(worst, worstHere.deviation);
    console.log(`T = ${T} K: largest deviation ${worstHere.deviation.toExponential(2)} of the species' scale (${worstHere.where}); Radau ${theirs.at(-1)!.steps} steps to 50 s`);
  }
  console.log(worst <= 1e-5 ? "agrees to 1e-5 relative over the whole horizon" : "DISAGREES beyond 1e-5 relative");
}

main();
