import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { CollabEditor } from "./collab-editor";

describe("the editor on the server", () => {
  it("sends its host without an editor, which needs the browser", () => {
    const html = renderToString(createElement(CollabEditor, { source: null, awareness: null, readOnly: true }));
    expect(html).toContain('data-testid="collab-editor"');
    expect(html).not.toContain("cm-editor");
  });
});
