import { EditorState } from "@codemirror/state";
import { describe, expect, it } from "vitest";
import { ySyncAnnotation } from "y-codemirror.next";
import { refusalReasons } from "~/shared/room-refusal";
import { NUL_REMOVED, textLimits, utf8Bytes } from "./text-limits";

function editor(doc: string, maxBytes: number) {
  const notices: string[] = [];
  const state = EditorState.create({ doc, extensions: textLimits((message) => notices.push(message), maxBytes) });
  return { state, notices };
}

describe("textLimits", () => {
  it("counts UTF-8 bytes as Node does", () => {
    for (const text of ["", "A -> B", "α ⇌ β", "😀 + x", "\ud800 lone", "end \udc00"]) expect(utf8Bytes(text)).toBe(Buffer.byteLength(text));
  });

  it("refuses the user's change that would take the text over the limit, and says why", () => {
    const { state, notices } = editor("A -> B\n", 20);
    const fits = state.update({ changes: { from: 7, insert: "B -> C\n" } }).state;
    expect(fits.doc.toString()).toBe("A -> B\nB -> C\n");
    const refused = fits.update({ changes: { from: 0, insert: "é".repeat(4) } });
    expect(refused.state.doc.toString()).toBe("A -> B\nB -> C\n");
    expect(notices).toEqual([refusalReasons["text-too-large"]]);
    // Replacing keeps within the limit when the bytes removed make room.
    const replaced = fits.update({ changes: { from: 0, to: 6, insert: "é".repeat(6) } }).state;
    expect(replaced.doc.toString()).toBe("éééééé\nB -> C\n");
  });

  it("lets co-authors' edits through untouched", () => {
    const { state, notices } = editor("A", 4);
    const remote = state.update({ changes: { from: 1, insert: "\0 -> B" }, annotations: ySyncAnnotation.of({} as never) }).state;
    expect(remote.doc.toString()).toBe("A\0 -> B");
    expect(notices).toEqual([]);
  });

  it("strips NUL from what the user inserts, keeping the caret after it", () => {
    const { state, notices } = editor("A -> B\n", 1000);
    const pasted = state.update({ changes: { from: 7, insert: "B\0 -> \0C\n" }, selection: { anchor: 16 } }).state;
    expect(pasted.doc.toString()).toBe("A -> B\nB -> C\n");
    expect(pasted.selection.main.head).toBe(14);
    expect(notices).toEqual([NUL_REMOVED]);
  });
});
