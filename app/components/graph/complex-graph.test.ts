import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ComplexGraph } from "./complex-graph";

const report = {
  complexes: ["X", "2X"],
  reactions: [{ from: 0, to: 1, rate: 1 }],
  linkageClasses: [[0, 1]],
  terminalStrongLinkageClasses: [[1]],
};

describe("the graph on the server", () => {
  it("sends its box without React Flow, which measures the browser's DOM", () => {
    const html = renderToString(createElement(ComplexGraph, { report, layout: null, canEdit: false, synced: false }));
    expect(html).toContain('data-testid="complex-graph"');
    expect(html).not.toContain("react-flow");
  });
});
