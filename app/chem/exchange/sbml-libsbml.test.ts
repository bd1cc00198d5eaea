import { spawnSync } from "node:child_process";
import { readdirSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseMechanism } from "~/chem/parse";
import { demoMechanisms } from "../../../server/seed/demo";
import { checkSbml } from "./sbml-check";
import { exportSbml } from "./sbml-export";
import { importSbml } from "./sbml-import";

// libSBML's own consistency check (Debian's libsbml5-perl) on our exports, where it is installed.
const script = new URL("../../../tests/support/libsbml-check.pl", import.meta.url).pathname;
const available = spawnSync("perl", ["-MLibSBML", "-e", "1"]).status === 0;

function libsbmlErrors(xml: string): string[] {
  const run = spawnSync("perl", [script], { input: xml, encoding: "utf8" });
  if (run.status !== 0) throw new Error(run.stderr);
  return run.stdout.split("\n").filter(Boolean);
}

function exported(source: string, title: string): string {
  return exportSbml(parseMechanism(source).mechanism, { title });
}

const fixtures = new URL("../../../tests/fixtures/sbml/", import.meta.url);
const weaveFixtures = new URL("../../../tests/fixtures/", import.meta.url);

describe.skipIf(!available)("libSBML accepts every export", { timeout: 60_000 }, () => {
  const cases: [string, string][] = [
    ...demoMechanisms.map((demo): [string, string] => [`demo: ${demo.title}`, exported(demo.source, demo.title)]),
    ...readdirSync(weaveFixtures)
      .filter((name) => name.endsWith(".weave") && name !== "broken.weave")
      .map((name): [string, string] => [`fixture ${name}`, exported(readFileSync(new URL(name, weaveFixtures), "utf8"), name)]),
    ...readdirSync(fixtures).map((name): [string, string] => {
      const back = importSbml(readFileSync(new URL(name, fixtures), "utf8"));
      if ("errors" in back) throw new Error(back.errors.join("\n"));
      return [`re-export of ${name}`, exported(back.source, name)];
    }),
    ["expression coefficients", exported("r1: A + B -> C @ 2.0e6 * T^0.5 * exp(-6000 / T)\nr2: C <=> D @ 1, sqrt(T)/log(T)\nT = 1000\n", "hot")],
    ["species only in a custom law", exported("S -> P @ { Vmax * S / (Km + S) / (1 + I / Ki) }\nI + S -> S @ 0\nfixed [I] = 0.2\nVmax = 1\nKm = 0.5\nKi = 0.1\n", "inhibited")],
  ];
  for (const [name, xml] of cases) {
    it(name, () => {
      expect(libsbmlErrors(xml)).toEqual([]);
      expect(checkSbml(xml)).toEqual([]);
    });
  }

  it("and our own check refuses what libSBML refuses: a law naming a species the reaction does not list", () => {
    const xml = exported("S -> P @ { k * S * I }\nk = 1\nfixed [I] = 1\n", "m").replace(/<listOfModifiers>[^]*?<\/listOfModifiers>/, "");
    expect(libsbmlErrors(xml).join("\n")).toMatch(/^ERROR 21121: .*The species 'I' is not listed/);
    expect(checkSbml(xml)).toEqual(["The kinetic law of reaction r1 uses species I, which is not a reactant, product or modifier of the reaction."]);
  });
});
