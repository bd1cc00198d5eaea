// The live pieces are rendered on the server as part of the mechanism page; there they must send
// only their host elements (the editor and React Flow need the browser) and never throw.
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { CollabEditor } from "./editor/collab-editor";
import { ComplexGraph } from "./graph/complex-graph";

const report = {
  complexes: ["X", "2X"],
  reactions: [{ from: 0, to: 1, rate: 1 }],
  linkageClasses: [[0, 1]],
  terminalStrongLinkageClasses: [[1]],
};

describe("server rendering of the live pieces", () => {
  it("sends the editor's host without an editor", () => {
    const html = renderToString(createElement(CollabEditor, { source: null, awareness: null, readOnly: true }));
    expect(html).toContain('data-testid="collab-editor"');
    expect(html).not.toContain("cm-editor");
  });

  it("sends the graph's box without React Flow", () => {
    const html = renderToString(createElement(ComplexGraph, { report, layout: null, canEdit: false, synced: false }));
    expect(html).toContain('data-testid="complex-graph"');
    expect(html).not.toContain("react-flow");
  });
});
