import { describe, expect, it } from "vitest";
import { buildNetwork } from "~/chem/network";
import { parseMechanism, printMechanism } from "~/chem/parse";
import { checkSbml } from "./sbml-check";
import { exportSbml } from "./sbml-export";
import { importSbml } from "./sbml-import";

function exported(source: string): string {
  const { mechanism, diagnostics } = parseMechanism(source);
  expect(diagnostics.filter((each) => each.severity === "error")).toEqual([]);
  return exportSbml(mechanism, { title: "Expressions" });
}

function imported(xml: string) {
  const result = importSbml(xml);
  if ("errors" in result) throw new Error(`import failed:\n${result.errors.join("\n")}`);
  return result;
}

/** The text without its import header, printed canonically. */
function canonical(source: string): string {
  return printMechanism(parseMechanism(source).mechanism);
}

const temperature = `r1: A + B -> C @ 2.0e6 * T^0.5 * exp(-6000 / T)
r2: C <=> 2D @ kf = 3, kf * exp(-(Ea - 100) / (R * T))
T = 1000
Ea = 5000
R = 8.314
[A]0 = 1
[B]0 = 0.5
`;

describe("SBML export of rate coefficients written as arithmetic", () => {
  it("writes each as a parameter with its value and an initial assignment, and validates", () => {
    const xml = exported(temperature);
    expect(checkSbml(xml)).toEqual([]);
    // 2e6 · √1000 · e^(−6) = 156 770.05…
    expect(xml).toMatch(/<parameter id="r1_k" value="156770\.05\d*" constant="true"\/>/);
    expect(xml).toContain('<initialAssignment symbol="r1_k">');
    expect(xml).toContain('<initialAssignment symbol="r2_kb">');
    expect(xml).not.toContain('symbol="r2_kf"');
  });

  it("reads them back as the same expressions, leaving no helper parameters behind", () => {
    const back = imported(exported(temperature));
    expect(back.warnings).toEqual([]);
    expect(canonical(back.source)).toBe(canonical(temperature));
    const rates = (source: string) => buildNetwork(parseMechanism(source).mechanism).reactions.map((r) => r.rate);
    expect(rates(back.source)).toEqual(rates(temperature));
  });

  it("says which initial assignments of a file it does not read", () => {
    const xml = exported("A -> B @ k\nk = 2\nT = 300\n").replace(
      "</listOfParameters>",
      '</listOfParameters><listOfInitialAssignments><initialAssignment symbol="k"><math xmlns="http://www.w3.org/1998/Math/MathML"><apply><times/><cn>2</cn><ci>T</ci></apply></math></initialAssignment></listOfInitialAssignments>',
    );
    // An assignment to a coefficient is read as its expression; to anything else it is reported.
    expect(canonical(imported(xml).source)).toBe(canonical("r1: A -> B @ 2*T\nT = 300\n"));
    const other = exported("A -> B @ k\nk = 2\nT = 300\n").replace(
      "</listOfParameters>",
      '</listOfParameters><listOfInitialAssignments><initialAssignment symbol="A"><math xmlns="http://www.w3.org/1998/Math/MathML"><cn>3</cn></math></initialAssignment></listOfInitialAssignments>',
    );
    expect(imported(other).warnings).toEqual(["Not imported: the initial assignments to A; their values as given in the file are used."]);
  });
});

describe("SBML that validates: species a custom law names besides its reactants and products", () => {
  // An inhibitor I held constant, named by a law that neither consumes nor makes it.
  const inhibited = [
    "S -> P @ { Vmax * S / (Km + S) / (1 + I / Ki) }",
    "E -> 0 @ 0.1",
    "I + E -> E @ 0",
    "fixed [I] = 0.2",
    "Vmax = 1",
    "Km = 0.5",
    "Ki = 0.1",
    "[S]0 = 1",
    "[E]0 = 1",
  ].join("\n");

  it("lists them as modifiers, so the export passes the kinetic-law rule", () => {
    const xml = exported(inhibited);
    expect(xml).toMatch(/<listOfModifiers>\s*<modifierSpeciesReference species="I"\/>\s*<\/listOfModifiers>/);
    expect(checkSbml(xml)).toEqual([]);
    const withoutModifiers = xml.replace(/<listOfModifiers>[^]*?<\/listOfModifiers>/, "");
    expect(checkSbml(withoutModifiers)).toEqual(["The kinetic law of reaction r1 uses species I, which is not a reactant, product or modifier of the reaction."]);
  });

  it("keeps a species that appears only in a law through the round trip, held constant", () => {
    const source = "S -> P @ { k * S * I }\nk = 2\nfixed [I] = 0.2\n[S]0 = 1\n";
    const xml = exported(source);
    expect(checkSbml(xml)).toEqual([]);
    const back = imported(xml);
    const { mechanism } = parseMechanism(back.source);
    expect(mechanism.fixed).toEqual({ I: 0.2 });
    expect(mechanism.steps[0].law).toBe("k * S * I");
    // And the re-export of the import validates too.
    expect(checkSbml(exportSbml(mechanism, { title: "again" }))).toEqual([]);
  });
});
