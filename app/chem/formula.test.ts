import { describe, expect, it } from "vitest";
import { readFormula } from "./formula";

function read(text: string) {
  const reading = readFormula(text);
  if (!reading.ok) throw new Error(`${text}: ${reading.problem}`);
  return reading.formula;
}

function problem(text: string): string {
  const reading = readFormula(text);
  if (reading.ok) throw new Error(`${text} was read`);
  return reading.problem;
}

describe("reading formulas", () => {
  it("counts the atoms of neutral molecules and radicals", () => {
    expect(read("CH4")).toEqual({ atoms: { C: 1, H: 4 }, charge: 0 });
    expect(read("HO2")).toEqual({ atoms: { H: 1, O: 2 }, charge: 0 });
    expect(read("H2O2")).toEqual({ atoms: { H: 2, O: 2 }, charge: 0 });
    expect(read("CH3CH2OH")).toEqual({ atoms: { C: 2, H: 6, O: 1 }, charge: 0 });
    expect(read("C60")).toEqual({ atoms: { C: 60 }, charge: 0 });
  });

  it("prefers the two-letter symbol: Co is cobalt, CO carbon monoxide", () => {
    expect(read("Co").atoms).toEqual({ Co: 1 });
    expect(read("CO").atoms).toEqual({ C: 1, O: 1 });
    expect(read("NaCl").atoms).toEqual({ Na: 1, Cl: 1 });
  });

  it("multiplies groups in parentheses and brackets, nested too", () => {
    expect(read("Ca(OH)2").atoms).toEqual({ Ca: 1, O: 2, H: 2 });
    expect(read("Al2(SO4)3").atoms).toEqual({ Al: 2, S: 3, O: 12 });
    expect(read("K4[Fe(CN)6]").atoms).toEqual({ K: 4, Fe: 1, C: 6, N: 6 });
    expect(read("(CH3)3COH").atoms).toEqual({ C: 4, H: 10, O: 1 });
  });

  it("reads charges: a trailing sign, a monatomic ion's digits, or a charge set apart with ^ or a space", () => {
    expect(read("OH-")).toEqual({ atoms: { O: 1, H: 1 }, charge: -1 });
    expect(read("H+")).toEqual({ atoms: { H: 1 }, charge: 1 });
    expect(read("NH4+")).toEqual({ atoms: { N: 1, H: 4 }, charge: 1 });
    expect(read("MnO4-")).toEqual({ atoms: { Mn: 1, O: 4 }, charge: -1 });
    expect(read("H3O+")).toEqual({ atoms: { H: 3, O: 1 }, charge: 1 });
    expect(read("Fe3+")).toEqual({ atoms: { Fe: 1 }, charge: 3 });
    expect(read("Fe++")).toEqual({ atoms: { Fe: 1 }, charge: 2 });
    expect(read("Fe+3")).toEqual({ atoms: { Fe: 1 }, charge: 3 });
    expect(read("O2-")).toEqual({ atoms: { O: 1 }, charge: -2 });
    expect(read("O2^-")).toEqual({ atoms: { O: 2 }, charge: -1 });
    expect(read("SO4^2-")).toEqual({ atoms: { S: 1, O: 4 }, charge: -2 });
    expect(read("C2O4 2-")).toEqual({ atoms: { C: 2, O: 4 }, charge: -2 });
    expect(read("SO4--")).toEqual({ atoms: { S: 1, O: 4 }, charge: -2 });
    expect(read("[Fe(CN)6]^3-")).toEqual({ atoms: { Fe: 1, C: 6, N: 6 }, charge: -3 });
  });

  it("reads e- as the electron of a half-reaction", () => {
    expect(read("e-")).toEqual({ atoms: {}, charge: -1 });
  });

  it("says why a name is not a formula", () => {
    expect(problem("X")).toBe('"X" is not an element symbol.');
    expect(problem("Hx2")).toBe('"Hx" is not an element symbol.');
    expect(problem("M")).toBe('"M" is not an element symbol.');
    expect(problem("glucose")).toBe('"g" cannot stand at this place in a formula.');
    expect(problem("CH3_O")).toBe('"_" cannot stand at this place in a formula.');
    expect(problem("Ca(OH2")).toBe('"(" is not closed.');
    expect(problem("Ca()")).toBe("empty parentheses.");
    expect(problem("H0")).toBe("an atom count is a whole number from 1 up.");
    expect(problem("")).toBe("a formula needs at least one element.");
    expect(problem("+")).toBe("a formula needs at least one element.");
    expect(problem("Fe+-")).toBe('"Fe+-" ends in mixed signs.');
    expect(problem("H+O-")).toBe('"H+O-" has a sign inside it; a charge goes at the end, as in "SO4^2-".');
  });
});
