import { describe, expect, it } from "vitest";
import { elementBalance } from "./balance";
import { parseMechanism } from "./parse";

/** The balance report of steps written under `balanced`. */
function balanceOf(...lines: string[]) {
  return elementBalance(parseMechanism(["balanced", ...lines].join("\n")).mechanism)!;
}

function warnings(source: string): string[] {
  return parseMechanism(source)
    .diagnostics.filter((d) => d.severity === "warning")
    .map((d) => `${d.line}: ${d.message}`);
}

describe("published balanced equations balance", () => {
  it("combustion of methane (any general chemistry text, e.g. Atkins & Jones, Chemical Principles; from memory)", () => {
    const report = balanceOf("CH4 + 2O2 -> CO2 + 2H2O @ 1");
    expect(report.steps[0]).toMatchObject({ checked: true, atoms: {}, charge: 0, message: null });
  });

  it("the hydrogen–oxygen chain steps, a third body included (Glassman, Combustion, ch. 3; from memory)", () => {
    const report = balanceOf(
      "H + O2 -> OH + O @ 1",
      "O + H2 -> OH + H @ 1",
      "OH + H2 -> H2O + H @ 1",
      "H + O2 + M -> HO2 + M @ 1",
      "HO2 + HO2 -> H2O2 + O2 @ 1",
      "H2O2 + M -> 2OH + M @ 1",
    );
    expect(report.unreadable).toEqual([]);
    expect(report.steps.map((step) => [step.checked, step.message])).toEqual(Array(6).fill([true, null]));
  });

  it("permanganate–oxalate and dichromate–iron(II) redox with charges (Vogel's Textbook of Quantitative Chemical Analysis; from memory)", () => {
    const report = balanceOf(
      '2"MnO4-" + 5"C2O4^2-" + 16"H+" -> 2"Mn2+" + 10CO2 + 8H2O @ 1',
      '"Cr2O7^2-" + 6"Fe2+" + 14"H+" -> 2"Cr3+" + 6"Fe3+" + 7H2O @ 1',
      '"MnO4-" + 8"H+" + 5"e-" -> "Mn2+" + 4H2O @ 1',
    );
    expect(report.steps.map((step) => step.message)).toEqual([null, null, null]);
  });

  it("neutralisation of slaked lime, with parentheses (common practice, no source)", () => {
    expect(balanceOf('"Ca(OH)2" + 2HCl -> CaCl2 + 2H2O @ 1').steps[0].message).toBeNull();
  });
});

describe("unbalanced steps are told the difference", () => {
  it("names the atoms short on each side", () => {
    const [step] = balanceOf("r1: CH4 + O2 -> CO2 + H2O @ 1").steps;
    expect(step).toMatchObject({ label: "r1", line: 2, checked: true, atoms: { H: -2, O: 1 }, charge: 0 });
    expect(step.message).toBe("Not balanced: 2 H short on the right, 1 O short on the left.");
  });

  it("names the charge of each side", () => {
    expect(balanceOf('"H+" + OH -> H2O @ 1').steps[0].message).toBe("Not balanced: charge +1 on the left, 0 on the right.");
    expect(balanceOf('"Fe3+" -> "Fe2+" @ 1').steps[0]).toMatchObject({ atoms: {}, charge: -1, message: "Not balanced: charge +3 on the left, +2 on the right." });
    expect(balanceOf('H2O -> "H+" + H @ 1').steps[0].message).toBe("Not balanced: 1 O short on the right; charge 0 on the left, +1 on the right.");
  });

  it("warns on the step's line in the parse, as the editor shows it", () => {
    expect(warnings("balanced\nH2 + O2 -> H2O @ 1\nH2 + O -> H2O @ 1\n")).toEqual(["2: Not balanced: 1 O short on the right."]);
  });
});

describe("what is not judged", () => {
  it("never warns about an abstract network, with or without balanced", () => {
    const abstract = "X + Q -> 2Q @ 1\nQ -> Z @ 2\nZ <=> X @ 1, 1\n";
    expect(warnings(abstract)).toEqual([]);
    expect(elementBalance(parseMechanism(abstract).mechanism)).toBeNull();
    const report = elementBalance(parseMechanism(`balanced\n${abstract}`).mechanism)!;
    expect(report.steps.every((step) => !step.checked && step.message === null)).toBe(true);
  });

  it("says once, on the directive, which names are not formulas", () => {
    expect(warnings("balanced\nX + Q -> 2Q @ 1\nQ -> Z @ 2\nH2 + O2 -> H2O2 @ 1\n")).toEqual([
      "1: X, Q and Z are not formulas, so 2 steps are not checked for balance; declare one as formula [X] = … if it is a compound.",
    ]);
  });

  it("needs no formula for a spectator such as a third body", () => {
    const report = balanceOf("H + O2 + M -> HO2 + M @ 1", "2Bath + O3 -> 2Bath + O2 + O @ 1");
    expect(report.unreadable).toEqual([]);
    expect(report.steps.map((step) => step.checked)).toEqual([true, true]);
  });

  it("reads a declared formula where the name is not one", () => {
    const source = "balanced\nGlc + 6O2 -> 6CO2 + 6H2O @ 1\nOx + 2\"H+\" -> C2H2O4 @ 1\nformula [Glc] = C6H12O6\nformula [Ox] = \"C2O4^2-\"\n";
    expect(warnings(source)).toEqual([]);
    expect(parseMechanism(source).mechanism.elementBalance).toEqual({ formulas: { Glc: "C6H12O6", Ox: "C2O4^2-" } });
  });
});

describe("the directive and the declarations", () => {
  it("reports a formula that cannot be read, and formulas without balanced", () => {
    expect(warnings("A -> B @ 1\nformula [A] = Hx2\n")).toEqual(['2: Hx2 cannot be read as a formula: "Hx" is not an element symbol.']);
    expect(warnings("A -> B @ 1\nformula [A] = C2H4\nformula [B] = C2H4\n")).toEqual([
      "2: Formulas are used by the element balance, which is off: add a line balanced to check every step.",
    ]);
    expect(warnings("balanced\nA -> B @ 1\nformula [A] = C2H4\nformula [A] = C2H6\nformula [C] = CH4\nformula [B] = C2H4\n")).toEqual([
      "4: A already has a formula on line 3.",
      "5: C takes part in no step; its formula is not used.",
    ]);
  });

  it("refuses a broken directive with a hint, and keeps the words free as names", () => {
    const diagnostics = (source: string) => parseMechanism(source).diagnostics.map((d) => `${d.severity} ${d.line}: ${d.message}`);
    expect(diagnostics("balanced 2\n")).toEqual(["error 1: balanced stands alone on its line."]);
    expect(diagnostics("formula [X] = 12\n")).toEqual(['error 1: Write a formula as formula [Glc] = C6H12O6, a charged one in quotes: formula [Ox] = "C2O4^2-".']);
    expect(diagnostics("balanced + formula -> 2formula @ balanced_k\nbalanced_k = 1\n")).toEqual([]);
    expect(diagnostics("balanced\nbalanced\n")).toEqual(["warning 2: The mechanism is already declared balanced on line 1."]);
  });
});
