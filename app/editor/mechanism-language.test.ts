import { foldable } from "@codemirror/language";
import { EditorState } from "@codemirror/state";
import { describe, expect, it } from "vitest";
import { mechanism } from "./mechanism-language";
import { quoteMatching } from "./quote-matching";

const stateOf = (doc: string, cursor = 0) => EditorState.create({ doc, selection: { anchor: cursor }, extensions: [mechanism()] });

describe("comment block folding", () => {
  const doc = "# one\n# two\n# three\nX -> Y @ 1\n# alone\nY -> 0 @ 2\n";

  it("folds a run of comment lines to its first line", () => {
    const state = stateOf(doc);
    const first = state.doc.line(1);
    expect(foldable(state, first.from, first.to)).toEqual({ from: first.to, to: state.doc.line(3).to });
  });

  it("does not fold a single comment line or the middle of a run", () => {
    const state = stateOf(doc);
    for (const number of [2, 5]) {
      const line = state.doc.line(number);
      expect(foldable(state, line.from, line.to)).toBeNull();
    }
  });
});

describe("quote matching", () => {
  const marksAt = (doc: string, cursor: number) => {
    const marks: { from: number; to: number; className: string }[] = [];
    stateOf(doc, cursor)
      .field(quoteMatching)
      .between(0, doc.length, (from, to, value) => void marks.push({ from, to, className: value.spec.class }));
    return marks;
  };

  it("marks both quotes when the cursor touches a quoted name", () => {
    const doc = '"Fe3+" -> X @ 1';
    const expected = [
      { from: 0, to: 1, className: "cm-matchingBracket" },
      { from: 5, to: 6, className: "cm-matchingBracket" },
    ];
    expect(marksAt(doc, 0)).toEqual(expected);
    expect(marksAt(doc, 6)).toEqual(expected);
    expect(marksAt(doc, 3)).toEqual([]);
  });

  it("marks the lone quote of an unterminated name", () => {
    expect(marksAt('"Fe3+ -> X', 0)).toEqual([{ from: 0, to: 1, className: "cm-nonmatchingBracket" }]);
  });
});
