import fc from "fast-check";
import { parse } from "mathjs";
import { describe, expect, it } from "vitest";
import { mathmlOf, readMathml, type Lambda } from "./mathml";
import { readXml, writeXml, type XmlElement } from "./xml";

const scope = { A: 0.7, B: 1.9, k: 2.5 };

function element(xml: string): XmlElement {
  const reading = readXml(xml);
  if (!reading.ok) throw new Error(reading.error);
  return reading.root;
}

function valueOf(math: string, functions: ReadonlyMap<string, Lambda> = new Map()): number {
  const reading = readMathml(element(math), functions);
  if (!reading.ok) throw new Error(reading.message);
  return reading.node.evaluate({ ...scope });
}

const math = (content: string) => `<math xmlns="http://www.w3.org/1998/Math/MathML">${content}</math>`;

/** Expressions in the rate-law vocabulary whose values stay finite and real at positive A, B, k. */
const expression: fc.Arbitrary<string> = fc.letrec<{ term: string }>((tie) => ({
  term: fc.oneof(
    { depthSize: "small", withCrossShrink: true },
    fc.constantFrom("A", "B", "k", "2", "0.5", "1.5e-3", "pi", "e"),
    fc.tuple(tie("term"), fc.constantFrom("+", "-", "*"), tie("term")).map(([a, op, b]) => `(${a} ${op} ${b})`),
    fc.tuple(tie("term"), tie("term")).map(([a, b]) => `${a} / (1 + abs(${b}))`),
    fc.tuple(tie("term"), fc.integer({ min: 0, max: 3 })).map(([a, n]) => `(${a})^${n}`),
    tie("term").map((a) => `-(${a})`),
    fc.tuple(fc.constantFrom("sin", "cos", "tanh", "abs", "cbrt"), tie("term")).map(([f, a]) => `${f}(${a})`),
    fc.tuple(fc.constantFrom("log", "log10", "sqrt"), tie("term")).map(([f, a]) => `${f}(1 + (${a})^2)`),
    tie("term").map((a) => `exp(tanh(${a}))`),
    fc.tuple(fc.constantFrom("min", "max"), tie("term"), tie("term")).map(([f, a, b]) => `${f}(${a}, ${b})`),
    fc.tuple(tie("term"), tie("term")).map(([a, b]) => `log(1 + (${a})^2, 2 + abs(${b}))`),
    tie("term").map((a) => `pow(abs(${a}), 1.5)`),
  ),
})).term;

describe("MathML", () => {
  it("writes and reads back every rate-law expression with the same value", () => {
    fc.assert(
      fc.property(expression, (text) => {
        const node = parse(text);
        const xml = writeXml(mathmlOf(node, (name) => (name in scope ? name : null)));
        const back = readMathml(element(xml.slice(xml.indexOf("<math"))), new Map());
        expect(back.ok).toBe(true);
        const [expected, actual] = [node.evaluate({ ...scope }), back.ok ? back.node.evaluate({ ...scope }) : NaN];
        expect(Math.abs(actual - expected)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(expected)));
      }),
      { numRuns: 300 },
    );
  });

  it("reads the number forms of content MathML", () => {
    expect(valueOf(math('<cn type="e-notation">1.5<sep/>-3</cn>'))).toBe(1.5e-3);
    expect(valueOf(math('<cn type="rational">1<sep/>4</cn>'))).toBe(0.25);
    expect(valueOf(math('<cn type="integer"> -3 </cn>'))).toBe(-3);
    expect(valueOf(math("<cn>2.5e2</cn>"))).toBe(250);
    expect(valueOf(math("<apply><root/><degree><cn>4</cn></degree><cn>16</cn></apply>"))).toBeCloseTo(2, 12);
    expect(valueOf(math("<apply><log/><logbase><cn>2</cn></logbase><cn>8</cn></apply>"))).toBeCloseTo(3, 12);
    expect(valueOf(math("<apply><log/><cn>1000</cn></apply>"))).toBeCloseTo(3, 12);
    expect(valueOf(math("<apply><times/></apply>"))).toBe(1);
  });

  it("skips semantics annotations and expands function definitions", () => {
    expect(valueOf(math('<semantics><apply><times/><ci>k</ci><ci>A</ci></apply><annotation encoding="text">k A</annotation></semantics>'))).toBeCloseTo(1.75, 12);
    const lambda = (xml: string): Lambda => {
      const root = element(math(xml)).children[0];
      const parameters = root.children.filter((each) => each.name === "bvar").map((bvar) => bvar.children[0].text);
      return { parameters, body: root.children.at(-1)! };
    };
    const functions = new Map([
      ["hill", lambda("<lambda><bvar><ci>x</ci></bvar><bvar><ci>n</ci></bvar><apply><divide/><apply><power/><ci>x</ci><ci>n</ci></apply><apply><plus/><cn>1</cn><apply><power/><ci>x</ci><ci>n</ci></apply></apply></apply></lambda>")],
      ["twice", lambda("<lambda><bvar><ci>y</ci></bvar><apply><times/><cn>2</cn><apply><ci>hill</ci><ci>y</ci><cn>2</cn></apply></apply></lambda>")],
    ]);
    const value = valueOf(math("<apply><ci>twice</ci><apply><plus/><ci>A</ci><ci>B</ci></apply></apply>"), functions);
    expect(value).toBeCloseTo((2 * 2.6 ** 2) / (1 + 2.6 ** 2), 12);
  });

  it("explains what it cannot read", () => {
    const problem = (xml: string, functions: ReadonlyMap<string, Lambda> = new Map()) => {
      const reading = readMathml(element(xml), functions);
      return reading.ok ? null : reading.message;
    };
    expect(problem('<math xmlns="urn:other"><ci>k</ci></math>')).toMatch(/MathML namespace/);
    expect(problem(math("<apply/>"))).toMatch(/empty/);
    expect(problem(math('<apply><times/><csymbol definitionURL="http://www.sbml.org/sbml/symbols/time">t</csymbol></apply>'))).toMatch(/<csymbol> is not something/);
    expect(problem(math("<apply><ci>f</ci><ci>A</ci></apply>"))).toMatch(/no function definition has that id/);
    expect(problem(math("<apply><divide/><ci>A</ci></apply>"))).toMatch(/<divide> takes 2 arguments, not 1/);
    expect(problem(math("<cn>1<sep/>2</cn>"))).toMatch(/cannot be read/);
    expect(problem(math('<cn base="16">ff</cn>'))).toMatch(/not in base 10/);
    const loop = new Map([["f", { parameters: ["x"], body: element(math("<apply><ci>f</ci><ci>x</ci></apply>")).children[0] }]]);
    expect(problem(math("<apply><ci>f</ci><ci>A</ci></apply>"), loop)).toMatch(/calls itself/);
  });
});
