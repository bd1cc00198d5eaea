import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { stoichiometricMatrixCsv } from "./csv";

describe("stoichiometric matrix CSV", () => {
  it("has species rows and reaction columns headed by the reaction", async () => {
    const csv = stoichiometricMatrixCsv(await analyzeSource("A + B -> C @ 1\nC <=> 2A @ 1, 2\n"));
    expect(csv).toBe(
      ["species,r1: A + B -> C,r2: C -> 2A,r3: 2A -> C", "A,-1,2,-2", "B,-1,0,0", "C,1,-1,1"].map((line) => `${line}\r\n`).join(""),
    );
  });

  it("quotes fields with commas, quotes and line breaks as RFC 4180 says", async () => {
    const csv = stoichiometricMatrixCsv(await analyzeSource('"Fe3+" + "a,b" -> q\nline -> 0\n'));
    const lines = csv.split("\r\n");
    expect(lines[0]).toBe('species,"r1: ""Fe3+"" + ""a,b"" -> q",r2: line -> 0');
    expect(lines[1]).toBe("Fe3+,-1,0");
    expect(lines[2]).toBe('"a,b",-1,0');
    expect(csv.endsWith("\r\n")).toBe(true);
  });

  it("neutralises species names a spreadsheet would run as formulas, and keeps numbers numbers", async () => {
    const csv = stoichiometricMatrixCsv(await analyzeSource('"=HYPERLINK(1)" + "@x" -> "+y" + "-z"\n'));
    const lines = csv.split("\r\n");
    // Header cells all start with "r1:"; the species cells are text and get the apostrophe.
    expect(lines.slice(1, 5).map((line) => line.split(",")[0]).sort()).toEqual(["'+y", "'-z", "'=HYPERLINK(1)", "'@x"]);
    // A coefficient of -1 is data: it stays a number a spreadsheet can add up.
    expect(lines.find((line) => line.startsWith("'@x"))).toBe("'@x,-1");
  });

  it("refuses a matrix too large for a spreadsheet", async () => {
    const report = await analyzeSource("A -> B @ 1\n");
    const huge = { ...report, species: Array.from({ length: 2000 }, (_, i) => `S${i}`), reactions: Array(1001).fill(report.reactions[0]) };
    expect(() => stoichiometricMatrixCsv(huge)).toThrow(/too large/);
  });
});
