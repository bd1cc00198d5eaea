import { describe, expect, it } from "vitest";
import { analyzeSource } from "./analysis";
import { concentrationRobustness } from "./acr";
import { buildNetwork } from "./network";
import { parseMechanism } from "./parse";

/** The report's facts the criterion reads, from the full analysis. */
async function robustness(text: string) {
  const report = await analyzeSource(text);
  const network = buildNetwork(parseMechanism(text).mechanism);
  return concentrationRobustness(network, { deficiency: report.deficiency, terminalStrongLinkageClasses: report.terminalStrongLinkageClasses, customLawCount: report.customLaws.length });
}

// Both networks as written in Shinar and Feinberg, Science 327 (2010) 1389, Fig. 1 and Fig. 2 —
// reproduced from memory, not from the paper at hand.
describe("Shinar–Feinberg examples", () => {
  it("A + B → 2B, B → A: A is robust, witnessed by A + B and B", async () => {
    const verdict = await robustness("A + B -> 2B @ 1\nB -> A @ 1\n");
    expect(verdict.species).toEqual(["A"]);
    expect(verdict.witnesses).toEqual([{ species: "A", complexes: ["A + B", "B"] }]);
  });

  it("the EnvZ–OmpR-type two-component model (deficiency 1): the phosphorylated regulator Yp is robust (XT and XT + Yp)", async () => {
    const text = [
      "XD <=> X @ 1, 1",
      "X <=> XT @ 1, 1",
      "XT -> Xp @ 1",
      "Xp + Y <=> XpY @ 1, 1",
      "XpY -> X + Yp @ 1",
      "XT + Yp <=> XTYp @ 1, 1",
      "XTYp -> XT + Y @ 1",
      "",
    ].join("\n");
    const verdict = await robustness(text);
    expect(verdict.species).toEqual(["Yp"]);
    expect(verdict.witnesses[0].complexes).toEqual(["XT", "XT + Yp"]);
    expect(verdict.conclusion).toMatch(/Shinar–Feinberg/);
  });

  it("says why it is silent: deficiency 0 (Michaelis–Menten), or no pair differing in one species", async () => {
    expect((await robustness("E + S <=> C @ 1, 1\nC -> E + P @ 1\n")).conclusion).toMatch(/deficiency 0/);
    const silent = await robustness("A + B -> 2B @ 1\nB -> C @ 1\n");
    expect(silent.species).toEqual([]);
    // The two-component model with the ADP-bound sensor as a second phosphatase has deficiency 2 (worked by hand: 13 − 4 − 7).
    const phosphatase = "XD <=> X @ 1, 1\nX <=> XT @ 1, 1\nXT -> Xp @ 1\nXp + Y <=> XpY @ 1, 1\nXpY -> X + Yp @ 1\nXT + Yp <=> XTYp @ 1, 1\nXTYp -> XT + Y @ 1\nXD + Yp <=> XDYp @ 1, 1\nXDYp -> XD + Y @ 1\n";
    expect((await robustness(phosphatase)).conclusion).toMatch(/deficiency 2/);
  });
});
