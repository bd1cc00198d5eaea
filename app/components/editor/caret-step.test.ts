import { EditorState } from "@codemirror/state";
import { describe, expect, it } from "vitest";
import { mechanism } from "~/editor/mechanism-language";
import { caretStep } from "./caret-step";

const doc = "# a comment\nr1: A + B -> C @ 2\nC -> A @ k\nk = 3\n";
const at = (cursor: number) => caretStep(EditorState.create({ doc, selection: { anchor: cursor }, extensions: [mechanism()] }));

describe("the step under the caret", () => {
  it("is read from the syntax tree: the label, and the line of a step without one", () => {
    expect(at(doc.indexOf("B"))).toEqual({ label: "r1", line: 2 });
    expect(at(doc.indexOf("@ 2"))).toEqual({ label: "r1", line: 2 });
    expect(at(doc.indexOf("C -> A") + 1)).toEqual({ label: null, line: 3 });
  });

  it("is null in a comment or a parameter line", () => {
    expect(at(3)).toBeNull();
    expect(at(doc.indexOf("k = 3") + 1)).toBeNull();
  });
});
