// Text ranges the page asks the editor to point out, such as the steps behind a graph node the
// reader clicked. They follow later edits, and a new request replaces the old one.
import { StateEffect, StateField } from "@codemirror/state";
import { Decoration, type DecorationSet, EditorView } from "@codemirror/view";

export interface TextRange {
  from: number;
  to: number;
}

const setLinkedRanges = StateEffect.define<readonly TextRange[]>();

const linkedMark = Decoration.mark({ class: "cm-mw-linked" });

export const linkedRanges = [
  StateField.define<DecorationSet>({
    create: () => Decoration.none,
    update(marks, transaction) {
      let next = marks.map(transaction.changes);
      for (const effect of transaction.effects) {
        if (effect.is(setLinkedRanges))
          next = Decoration.set(
            effect.value.map(({ from, to }) => linkedMark.range(from, to)),
            true,
          );
      }
      return next;
    },
    provide: (field) => EditorView.decorations.from(field),
  }),
  EditorView.theme({
    ".cm-mw-linked": {
      backgroundColor: "var(--mw-signal-soft)",
      boxShadow: "0 1px 0 color-mix(in oklab, var(--mw-signal) 70%, transparent)",
      borderRadius: "2px",
    },
  }),
];

/** Replaces the pointed-out ranges and scrolls the first into view; [] clears them. */
export function showLinkedRanges(view: EditorView, ranges: readonly TextRange[]): void {
  const length = view.state.doc.length;
  const valid = ranges
    .map(({ from, to }) => ({ from: Math.max(0, Math.min(from, length)), to: Math.max(0, Math.min(to, length)) }))
    .filter(({ from, to }) => to > from);
  view.dispatch({
    effects: [setLinkedRanges.of(valid), ...(valid.length > 0 ? [EditorView.scrollIntoView(valid[0].from, { y: "center" })] : [])],
  });
}
