import { readFileSync } from "node:fs";
import fc from "fast-check";
import { evaluate } from "mathjs";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { lawConstants, lawFunctions } from "~/chem/law";
import { parseMechanism } from "~/chem/parse";
import { demoMechanisms } from "../../../server/seed/demo";
import { isSId } from "./names";
import { checkSbml } from "./sbml-check";
import { exportSbml } from "./sbml-export";
import { importSbml } from "./sbml-import";

const fixture = (name: string) => readFileSync(new URL(`../../../tests/fixtures/sbml/${name}.xml`, import.meta.url), "utf8");

function imported(xml: string) {
  const result = importSbml(xml);
  if ("errors" in result) throw new Error(`import failed:\n${result.errors.join("\n")}`);
  return result;
}

function errorsOf(xml: string): string[] {
  const result = importSbml(xml);
  expect(result).not.toHaveProperty("source");
  return "errors" in result ? result.errors : [];
}

function exported(source: string, title = "Test mechanism"): string {
  const { mechanism, diagnostics } = parseMechanism(source);
  expect(diagnostics.filter((each) => each.severity === "error")).toEqual([]);
  return exportSbml(mechanism, { title });
}

/** What a round trip must keep: the network (complexes, reactions, rates), fixed species and ODEs. */
async function structure(source: string) {
  const report = await analyzeSource(source);
  const { mechanism } = parseMechanism(source);
  // Species in no step are left out on import (with a warning), so only those in steps count.
  const taking = new Set(mechanism.steps.flatMap((step) => [...step.reactants, ...step.products].map((term) => term.species)));
  return {
    species: report.species,
    complexes: report.complexes,
    reactions: report.reactions,
    fixed: Object.fromEntries(Object.entries(report.fixedSpecies).filter(([name]) => taking.has(name))),
    initial: Object.fromEntries(Object.entries(mechanism.initial).filter(([name, value]) => taking.has(name) && value !== 0)),
    odes: report.odes,
    deficiency: report.deficiency,
  };
}

/** Right-hand sides evaluated at positive values, for ODEs whose custom laws are spelled differently. */
function odeValues(odes: Record<string, string>): Record<string, number> {
  const scope: Record<string, number> = {};
  const symbol = (text: string) => text.replace(/"([^"]*)"/g, (_, name: string) => `q_${[...name].map((c) => c.charCodeAt(0)).join("_")}`);
  const names = new Set(Object.values(odes).flatMap((rhs) => symbol(rhs).match(/[A-Za-z_][A-Za-z0-9_]*/g) ?? []));
  for (const name of [...lawFunctions, ...lawConstants]) names.delete(name);
  [...names].sort().forEach((name, index) => (scope[name] = 1.7 + 0.13 * index));
  return Object.fromEntries(Object.entries(odes).map(([species, rhs]) => [species, evaluate(symbol(rhs), { ...scope }) as number]));
}

describe("SBML round trip of the demo mechanisms", () => {
  for (const demo of demoMechanisms) {
    it(demo.title, async () => {
      const xml = exported(demo.source, demo.title);
      expect(checkSbml(xml)).toEqual([]);
      const back = imported(xml);
      expect(back.title).toBe(demo.title);
      expect(back.warnings).toEqual([]);
      expect(await structure(back.source)).toEqual(await structure(demo.source));
    });
  }
});

describe("SBML export", () => {
  const awkward = `# names SBML cannot take as ids, labels colliding with parameters, custom laws
k1: "Fe3+" + "e-" -> "Fe2+" @ k1 = 2.5e-3
"Fe2+" + "a&b <c>" <=> "Fe3+" @ 4, k1
"2-butene" -> vessel @ 1e-7
vessel -> 0 @ { Vmax*vessel/(Km + vessel) + exp(-Km) * sqrt(vessel) + pi * e^(-vessel) }
0 -> ATP @ { kin * max(1, ATP) / log(1 + ATP) + cbrt(ATP) - log10(ATP + 10) + pow(ATP, 2)/(1 + ATP^3) }
ATP -> 0 @ { kin * sqrt(ATP - 1) }
ATP -> 2 ADP
ATP -> 2 ADP @ 0.5
Vmax = 3
Km = 0.25
kin = 1.5
["Fe3+"]0 = 0.1
fixed ["a&b <c>"] = 2
`;

  it("writes valid SIds, keeps the original names and passes the checks", () => {
    const xml = exported(awkward);
    expect(checkSbml(xml)).toEqual([]);
    const ids = [...xml.matchAll(/<(?:model|compartment|species|parameter|reaction) id="([^"]*)"/g)].map((match) => match[1]);
    expect(ids.every(isSId)).toBe(true);
    expect(new Set(ids).size).toBe(ids.length);
    expect(xml).toContain('id="Fe3_plus" name="Fe3+"');
    expect(xml).toContain('name="a&amp;b &lt;c&gt;"');
    expect(xml).toMatch(/id="s_2_minus_butene" name="2-butene"/);
    expect(xml).toMatch(/<species id="a_b_c" name="a&amp;b &lt;c&gt;" compartment="vessel_2" initialConcentration="2" hasOnlySubstanceUnits="false" boundaryCondition="true" constant="true"\/>/);
    expect(xml).toContain('<math xmlns="http://www.w3.org/1998/Math/MathML">');
    expect(xml).toMatch(/<cn type="e-notation">1<sep\/>-7<\/cn>|<localParameter id="k" value="1e-7"\/>/);
  });

  it("reads back to the same network, rates and ODEs", async () => {
    const back = imported(exported(awkward));
    const before = await structure(awkward);
    const after = await structure(back.source);
    expect({ ...after, odes: undefined }).toEqual({ ...before, odes: undefined });
    const [valuesBefore, valuesAfter] = [odeValues(before.odes), odeValues(after.odes)];
    for (const species of Object.keys(valuesBefore)) expect(valuesAfter[species]).toBeCloseTo(valuesBefore[species], 10);
    expect(back.warnings.filter((warning) => /custom rate law/.test(warning))).toHaveLength(3);
    expect(back.warnings).toContain(
      "Reaction r6: its kinetic law is not mass action (it is not a finite real number at every positive concentration); it is kept as a custom rate law.",
    );
    expect(back.warnings).toContain("Reaction r7 has no kinetic law, so its step has no rate coefficient.");
  });

  it("round-trips random mass-action mechanisms", async () => {
    const species = fc.constantFrom("A", "B", "C2", '"Fe3+"', '"x y"', "vessel", "k");
    const complex = fc.uniqueArray(species, { maxLength: 3 }).chain((names) =>
      fc.tuple(...names.map((name) => fc.integer({ min: 1, max: 3 }).map((n) => `${n === 1 ? "" : n}${name}`))).map((terms) => terms.join(" + ") || "0"),
    );
    const rate = fc.oneof(fc.constantFrom("ka", "kb", "kf"), fc.double({ min: 1e-9, max: 1e9, noNaN: true }).map(String));
    const step = fc.record({ left: complex, right: complex, reversible: fc.boolean(), forward: rate, backward: rate });
    await fc.assert(
      fc.asyncProperty(fc.array(step, { minLength: 1, maxLength: 6 }), fc.boolean(), async (steps, fixedA) => {
        const lines = steps.map(({ left, right, reversible, forward, backward }) =>
          reversible ? `${left} <=> ${right} @ ${forward}, ${backward}` : `${left} -> ${right} @ ${forward}`,
        );
        const source = [...lines, "ka = 1.5", "kb = 0.25", "kf = 3e-4", "[B]0 = 0.5", ...(fixedA ? ["fixed [A] = 2"] : [])].join("\n");
        const parsed = parseMechanism(source);
        fc.pre(parsed.diagnostics.every((each) => each.severity !== "error"));
        const xml = exportSbml(parsed.mechanism, { title: "random" });
        expect(checkSbml(xml)).toEqual([]);
        expect(await structure(imported(xml).source)).toEqual(await structure(source));
      }),
      { numRuns: 60 },
    );
  });
});

describe("SBML import of hand-written textbook models", () => {
  it("Michaelis–Menten elementary steps (Level 3 Version 1, compartment factors, global parameters)", async () => {
    const xml = fixture("michaelis-menten");
    expect(checkSbml(xml)).toEqual([]);
    const back = imported(xml);
    expect(back.title).toBe("Michaelis–Menten enzyme scheme");
    expect(back.warnings).toEqual([]);
    const report = await analyzeSource(back.source);
    expect(report.diagnostics).toEqual([]);
    expect(report.species).toEqual(["enzyme", "substrate", "enzyme–substrate complex", "product"]);
    expect(report.complexes).toEqual(["enzyme + substrate", '"enzyme–substrate complex"', "enzyme + product"]);
    expect(report.reactions).toEqual([
      { from: 0, to: 1, rate: 1e6 },
      { from: 1, to: 0, rate: 1000 },
      { from: 1, to: 2, rate: 100 },
    ]);
    expect(report.deficiency).toBe(0);
    expect(report.odes.product).toBe('k2*"enzyme–substrate complex"');
  });

  it("Michaelis–Menten elementary steps in SBML Level 2 Version 4 (defaults, kinetic-law parameters)", async () => {
    const xml = fixture("michaelis-menten-level2");
    expect(checkSbml(xml)).toEqual([]);
    const back = imported(xml);
    expect(back.warnings).toEqual([]);
    expect(back.source).toContain("binding: E + S <=> ES @ 1000000, 1000\ncatalysis: ES -> E + P @ 100\n");
    const report = await analyzeSource(back.source);
    expect(report.diagnostics).toEqual([]);
    expect(report.complexes).toEqual(["E + S", "ES", "E + P"]);
    expect(report.deficiency).toBe(0);
    expect(report.conservationLaws).toHaveLength(2);
  });

  it("Lotka's scheme (local parameters, literal numbers, boundary species)", async () => {
    const back = imported(fixture("lotka-volterra"));
    const report = await analyzeSource(back.source);
    expect(report.diagnostics).toEqual([]);
    expect(report.species).toEqual(["X", "Y"]);
    expect(report.fixedSpecies).toEqual({ A: 1, B: 0 });
    expect(report.complexes).toEqual(["X", "2X", "X + Y", "2Y", "Y", "0"]);
    expect(report.reactions).toEqual([
      { from: 0, to: 1, rate: 1 },
      { from: 2, to: 3, rate: 0.5 },
      { from: 4, to: 5, rate: 0.3 },
    ]);
    expect(report.deficiency).toBe(1);
    expect(report.odes).toEqual({ X: "A*X - 0.5*X*Y", Y: "0.5*X*Y - 0.3*Y" });
  });

  it("the Brusselator (X*X*Y read as X^2*Y, fed species fixed)", async () => {
    const back = imported(fixture("brusselator"));
    const report = await analyzeSource(back.source);
    expect(report.diagnostics).toEqual([]);
    expect(report.species).toEqual(["X", "Y"]);
    expect(report.complexes).toEqual(["0", "X", "2X + Y", "3X", "Y"]);
    expect(report.reactions.map(({ from, to }) => [from, to])).toEqual([[0, 1], [2, 3], [1, 4], [1, 0]]);
    expect(report.reactions.map(({ rate }) => rate)).toEqual([1, 1, 3, 1]);
    expect(report.deficiency).toBe(1);
    expect(report.linkageClasses).toHaveLength(2);
  });

  it("keeps a law that is not mass action as a custom law, with a warning", async () => {
    const back = imported(fixture("michaelis-menten-rate-law"));
    expect(back.warnings).toEqual([
      "Reaction conversion: its kinetic law is not mass action (it is not a product of a rate coefficient and species concentrations); it is kept as a custom rate law.",
    ]);
    expect(back.source).toContain("conversion: S -> P @ { Vmax * S / (conversion_Km + S) }");
    const report = await analyzeSource(back.source);
    expect(report.diagnostics).toEqual([]);
    expect(report.customLaws).toHaveLength(1);
    expect(evaluate(report.odes.P, { Vmax: 2.5, conversion_Km: 0.5, S: 2 })).toBeCloseTo((2.5 * 2) / 2.5, 12);
  });
});

describe("SBML import of features that files written elsewhere use", () => {
  const model = `<?xml version="1.0" encoding="UTF-8"?>
<sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" xmlns:fbc="http://www.sbml.org/sbml/level3/version1/fbc/version2" level="3" version="2" fbc:required="false" other:required="true" xmlns:other="urn:example:other">
  <model id="elsewhere">
    <listOfFunctionDefinitions>
      <functionDefinition id="saturating">
        <math xmlns="http://www.w3.org/1998/Math/MathML">
          <lambda><bvar><ci>V</ci></bvar><bvar><ci>K</ci></bvar><bvar><ci>x</ci></bvar>
            <apply><divide/><apply><times/><ci>V</ci><ci>x</ci></apply><apply><plus/><ci>K</ci><ci>x</ci></apply></apply>
          </lambda>
        </math>
      </functionDefinition>
    </listOfFunctionDefinitions>
    <listOfCompartments>
      <compartment id="cytosol" size="2" constant="true"/>
      <compartment id="nucleus" size="1" constant="true"/>
    </listOfCompartments>
    <listOfSpecies>
      <species id="S" name="glucose 6-phosphate" compartment="cytosol" initialConcentration="4" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
      <species id="E" name="enzyme" compartment="cytosol" initialConcentration="0.2" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
      <species id="P" compartment="cytosol" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
      <species id="X" name="ATP" compartment="cytosol" initialConcentration="1" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
      <species id="Y" name="ATP" compartment="nucleus" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
      <species id="Q" name="Fe3+" compartment="cytosol" initialAmount="3" hasOnlySubstanceUnits="true" boundaryCondition="false" constant="false"/>
      <species id="Z" compartment="cytosol" hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/>
    </listOfSpecies>
    <listOfParameters>
      <parameter id="Vmax" value="3" constant="true"/>
      <parameter id="Km" value="0.5" constant="true"/>
      <parameter id="k1" value="0.1" constant="true"/>
      <parameter id="k2" value="4" constant="true"/>
      <parameter id="total" constant="false"/>
    </listOfParameters>
    <listOfRules>
      <assignmentRule variable="total"><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><plus/><ci>S</ci><ci>P</ci></apply></math></assignmentRule>
    </listOfRules>
    <listOfReactions>
      <reaction id="convert" reversible="false">
        <listOfReactants><speciesReference species="S" stoichiometry="1" constant="true"/></listOfReactants>
        <listOfProducts><speciesReference species="P" stoichiometry="1" constant="true"/></listOfProducts>
        <listOfModifiers><modifierSpeciesReference species="E"/></listOfModifiers>
        <kineticLaw>
          <math xmlns="http://www.w3.org/1998/Math/MathML">
            <apply><times/><ci>cytosol</ci><ci>E</ci><apply><ci>saturating</ci><ci>Vmax</ci><ci>Km</ci><ci>S</ci></apply></apply>
          </math>
        </kineticLaw>
      </reaction>
      <reaction id="r2" name="transport step" reversible="true">
        <listOfReactants><speciesReference species="X" stoichiometry="1" constant="true"/></listOfReactants>
        <listOfProducts><speciesReference species="Y" stoichiometry="1" constant="true"/></listOfProducts>
        <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><times/><ci>k1</ci><ci>X</ci></apply></math></kineticLaw>
      </reaction>
      <reaction id="r3" name="combine" reversible="false">
        <listOfReactants>
          <speciesReference species="X" stoichiometry="1" constant="true"/>
          <speciesReference species="Y" stoichiometry="1" constant="true"/>
        </listOfReactants>
        <listOfProducts><speciesReference species="Q" stoichiometry="1" constant="true"/></listOfProducts>
        <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><times/><cn>2</cn><ci>k1</ci><ci>k2</ci><ci>X</ci><ci>Y</ci></apply></math></kineticLaw>
      </reaction>
      <reaction id="r4" reversible="false">
        <listOfReactants><speciesReference species="Q" constant="true"/></listOfReactants>
        <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><times/><ci>k1</ci><ci>Q</ci></apply></math></kineticLaw>
      </reaction>
      <reaction id="r5" reversible="false">
        <listOfReactants><speciesReference species="P" stoichiometry="1" constant="true"/></listOfReactants>
      </reaction>
    </listOfReactions>
  </model>
</sbml>`;

  // S is named by its id, since a custom law uses it and "glucose 6-phosphate" is no identifier;
  // the two species named ATP keep their ids; "transport step" is no label, so r2 stays.
  it("translates every step and says what it changed", async () => {
    expect(checkSbml(model)).toEqual([]);
    const back = imported(model);
    expect(back.title).toBe("elsewhere");
    expect(back.source).toBe(`# Imported from SBML Level 3 Version 2: elsewhere
convert: S -> P @ { enzyme * Vmax * S / (Km + S) }
r2: X -> Y @ k1
combine: X + Y -> "Fe3+" @ 0.8
r4: "Fe3+" -> 0 @ k1
r5: P -> 0

Vmax = 3
Km = 0.5
k1 = 0.1
k2 = 4
[S]0 = 4
[X]0 = 1
["Fe3+"]0 = 3
fixed [enzyme] = 0.2
`);
    expect(back.warnings).toEqual([
      "Not imported: the file's rules, required SBML package other. Mechweave reads species, parameters and reactions with their kinetic laws.",
      "Mechweave models one well-mixed volume: every compartment is read with size 1, and concentrations as given.",
      "Parameter total has no value and no law uses it; it is left out.",
      "Species Z takes part in no reaction and is left out.",
      "Species E appears only in rate laws, so nothing changes it: it is held at its initial concentration (fixed).",
      "Reaction convert: its kinetic law is not mass action (it is not a product of a rate coefficient and species concentrations); it is kept as a custom rate law.",
      "Reaction r2 is marked reversible but its kinetic law has no backward term; it is read as irreversible.",
      "Reaction r3: its rate coefficient combines several parameters and is written as its value.",
      "Reaction r4: a species reference gives no stoichiometry; it is read as 1.",
      "Reaction r5 has no kinetic law, so its step has no rate coefficient.",
    ]);
    const report = await analyzeSource(back.source);
    expect(report.diagnostics.filter((each) => each.severity === "error")).toEqual([]);
  });
});

describe("SBML import refuses bad files with clear errors", () => {
  const good = fixture("brusselator");
  const cases: [string, string, RegExp][] = [
    ["not XML", "species A, B and C", /not well-formed XML/],
    ["unclosed XML", good.replace("</model>", ""), /not well-formed XML \(line \d+/],
    ["not SBML", "<html><body>hello</body></html>", /not an SBML file: its root element is <html>/],
    ["SBML Level 1", '<sbml xmlns="http://www.sbml.org/sbml/level1" level="1" version="2"><model/></sbml>', /SBML Level 1 Version 2; Mechweave reads SBML Levels 2 and 3/],
    ["unknown namespace", good.replace("level3/version2/core", "level4/version1/core"), /must declare the SBML Level 3 Core namespace/],
    ["no model", good.replace(/<model[\s\S]*<\/model>/, ""), /holds no <model>/],
    ["missing species attribute", good.replace('<species id="X" compartment="reactor"', '<species id="X"'), /<species id="X">: the required attribute compartment is missing/],
    ["missing reaction attribute", good.replace('<reaction id="feed" reversible="false">', '<reaction id="feed">'), /<reaction id="feed">: the required attribute reversible is missing/],
    ["missing speciesReference constant", good.replace('<speciesReference species="A" stoichiometry="1" constant="true"/>', '<speciesReference species="A" stoichiometry="1"/>'), /<speciesReference species="A">: the required attribute constant is missing/],
    ["unknown species", good.replace('<speciesReference species="A" stoichiometry="1" constant="true"/></listOfReactants>', '<speciesReference species="Q" stoichiometry="1" constant="true"/></listOfReactants>'), /Reaction feed: its reactant Q is not a species defined in listOfSpecies/],
    ["unknown compartment", good.replace('<species id="X" compartment="reactor"', '<species id="X" compartment="flask"'), /Species X: its compartment flask is not defined/],
    ["duplicate ids", good.replace('<parameter id="k4"', '<parameter id="X"').replace("<ci>k4</ci>", "<ci>X</ci>"), /The id X is used twice, by a species and a parameter/],
    ["invalid SId", good.replace('<parameter id="k4"', '<parameter id="4k"'), /"4k" is not a valid SId/],
    ["bad boolean", good.replace('<reaction id="feed" reversible="false">', '<reaction id="feed" reversible="no">'), /reversible="no" must be true or false/],
    ["bad number", good.replace('<parameter id="k1" value="1"', '<parameter id="k1" value="one"'), /value="one" is not a number/],
    ["unknown unit", good.replace('<parameter id="k1" value="1"', '<parameter id="k1" units="per_second" value="1"'), /<parameter id="k1">: units="per_second" is neither an SBML base unit nor a unit definition in the file/],
    ["bad unit definition", good.replace("<listOfCompartments>", '<listOfUnitDefinitions><unitDefinition id="second"><listOfUnits><unit kind="fortnight" exponent="1" scale="0" multiplier="1"/></listOfUnits></unitDefinition></listOfUnitDefinitions><listOfCompartments>'), /second is a base unit and cannot be redefined[\s\S]*kind="fortnight" is not an SBML base unit/],
    ["unknown name in a law", good.replace("<ci>k1</ci>", "<ci>k9</ci>"), /uses k9, which is neither a local parameter nor defined in the model/],
    ["fractional stoichiometry", good.replace('species="X" stoichiometry="2"', 'species="X" stoichiometry="1.5"').replace("<ci>X</ci><ci>X</ci><ci>Y</ci>", "<ci>X</ci><ci>Y</ci>"), /stoichiometry 1.5 of X is not a whole number/],
    ["unsupported MathML", good.replace("<apply><times/><ci>k1</ci><ci>A</ci></apply>", "<piecewise><piece><ci>k1</ci><true/></piece></piecewise>"), /<piecewise> is not something a Mechweave rate law can express/],
    ["parameter without a value", good.replace('<parameter id="k1" value="1" constant="true"/>', '<parameter id="k1" constant="true"/>'), /feed: its kinetic law cannot be evaluated: it uses k1 without a value/],
    ["entity declarations", `<?xml version="1.0"?><!DOCTYPE sbml [<!ENTITY a "aaaa">]>${good.slice(good.indexOf("<sbml"))}`, /entities/],
  ];
  for (const [what, xml, message] of cases) {
    it(what, () => {
      const errors = errorsOf(xml);
      expect(errors.length).toBeGreaterThan(0);
      expect(errors.join("\n")).toMatch(message);
    });
  }

  it("never throws and never returns a partial translation, whatever the bytes", () => {
    const mutation = fc.tuple(fc.nat(good.length), fc.nat(40), fc.constantFrom("", "<", ">", '"', "&", "/", "x", "<apply>", "</ci>", "-1", "1e999"));
    fc.assert(
      fc.property(fc.array(mutation, { minLength: 1, maxLength: 4 }), (mutations) => {
        const xml = mutations.reduce((text, [at, length, insert]) => text.slice(0, at) + insert + text.slice(at + length), good);
        expect(() => checkSbml(xml)).not.toThrow();
        const result = importSbml(xml);
        if ("errors" in result) {
          expect(result.errors.length).toBeGreaterThan(0);
          expect(result).not.toHaveProperty("source");
        } else {
          expect(parseMechanism(result.source).diagnostics.filter((each) => each.severity === "error")).toEqual([]);
        }
      }),
      { numRuns: 300 },
    );
  });

  it("reports every problem of a file at once", () => {
    const broken = good.replace('<species id="X" compartment="reactor"', '<species id="X"').replace('<parameter id="k4"', '<parameter id="k3"');
    expect(errorsOf(broken)).toEqual([
      '<species id="X">: the required attribute compartment is missing.',
      "The id k3 is used twice, by two parameters; SIds must be unique in a model.",
      "The kinetic law of reaction removal uses k4, which is neither a local parameter nor defined in the model.",
    ]);
  });
});

describe("checkSbml", () => {
  it("accepts the hand-written models", () => {
    for (const name of ["michaelis-menten", "michaelis-menten-level2", "lotka-volterra", "brusselator", "michaelis-menten-rate-law"]) {
      expect(checkSbml(fixture(name))).toEqual([]);
    }
  });

  it("verifies a law declared as mass action numerically", () => {
    const declared = fixture("brusselator").replaceAll("<kineticLaw>", '<kineticLaw sboTerm="SBO:0000012">');
    expect(checkSbml(declared)).toEqual([]);
    const wrongOrder = declared.replace("<ci>k2</ci><ci>X</ci><ci>X</ci><ci>Y</ci>", "<ci>k2</ci><ci>X</ci><ci>Y</ci>");
    expect(checkSbml(wrongOrder)).toEqual([
      "The kinetic law of reaction autocatalysis is declared mass action (SBO:0000012), but it does not evaluate to the mass-action rate of the reaction's stoichiometry.",
    ]);
  });

  it("accepts a mass-action law however it is written, and a reversible law's two coefficients", () => {
    const reversible = fixture("michaelis-menten").replace("<kineticLaw>", '<kineticLaw sboTerm="SBO:0000012">');
    expect(checkSbml(reversible)).toEqual([]);
    const negative = reversible.replace('value="1000"', 'value="-1000"');
    expect(checkSbml(negative)[0]).toMatch(/fitted rate coefficients are negative/);
  });

  it("reports a law that cannot be evaluated, a malformed sboTerm and a repeated metaid", () => {
    const unevaluable = fixture("brusselator").replace('<parameter id="k1" value="1" constant="true"/>', '<parameter id="k1" constant="true"/>');
    expect(checkSbml(unevaluable)[0]).toMatch(/reaction feed cannot be evaluated: it uses k1 without a value/);
    expect(checkSbml(fixture("brusselator").replace("<kineticLaw>", '<kineticLaw sboTerm="12">'))[0]).toMatch(/<kineticLaw>: sboTerm "12" is not of the form/);
    const metaids = fixture("brusselator").replace('<species id="A"', '<species metaid="m1" id="A"').replace('<species id="B"', '<species metaid="m1" id="B"');
    expect(checkSbml(metaids)).toEqual(["The metaid m1 is used twice; metaids must be unique in a document."]);
  });
});
