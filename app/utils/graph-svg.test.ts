import { describe, expect, it } from "vitest";
import { complexGraphSvg } from "./graph-svg";

describe("complexGraphSvg", () => {
  const report = {
    complexes: ["A + B", "C", "0"],
    reactions: [
      { from: 0, to: 1, rate: 1 },
      { from: 1, to: 0, rate: 2 },
      { from: 1, to: 2, rate: 0.5 },
    ],
    linkageClasses: [[0, 1, 2]],
    terminalStrongLinkageClasses: [[2]],
  };

  it("draws every complex and reaction, with shared positions kept and the others placed", () => {
    const svg = complexGraphSvg(report, { C: { x: 400, y: 10 } }, { "--mw-ink": "#111111", "--mw-raised": "#ffffff" });
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg.match(/<path d="M /g)).toHaveLength(3);
    expect(svg).toContain(">A + B</text>");
    expect(svg).toContain(">∅</text>");
    expect(svg).toContain('x="400" y="10"');
    expect(svg).not.toContain("var(--");
  });

  it("escapes names that would break the XML", () => {
    const svg = complexGraphSvg({ ...report, complexes: ['"Fe3+" + <X>', "C", "0"] }, {}, {});
    expect(svg).toContain("&#60;X&#62;");
  });
});
