// Marks both quotes of a quoted species name when the cursor touches either end, the way
// bracket matching marks brackets; an unterminated name marks its lone quote as unmatched.
import { syntaxTree } from "@codemirror/language";
import { type EditorState, type Range, StateField } from "@codemirror/state";
import { Decoration, type DecorationSet, EditorView } from "@codemirror/view";

const matched = Decoration.mark({ class: "cm-matchingBracket" });
const unmatched = Decoration.mark({ class: "cm-nonmatchingBracket" });

function quoteMarks(state: EditorState): DecorationSet {
  const marks: Range<Decoration>[] = [];
  const tree = syntaxTree(state);
  for (const range of state.selection.ranges) {
    if (!range.empty) continue;
    for (const side of [-1, 1] as const) {
      const node = tree.resolveInner(range.head, side);
      if (node.name !== "QuotedName" || (range.head !== node.from && range.head !== node.to)) continue;
      const closed = node.to - node.from >= 2 && state.sliceDoc(node.to - 1, node.to) === '"';
      marks.push((closed ? matched : unmatched).range(node.from, node.from + 1));
      if (closed) marks.push(matched.range(node.to - 1, node.to));
      break;
    }
  }
  return Decoration.set(marks, true);
}

export const quoteMatching = StateField.define<DecorationSet>({
  create: quoteMarks,
  update: (marks, transaction) => (transaction.docChanged || transaction.selection ? quoteMarks(transaction.state) : marks),
  provide: (field) => EditorView.decorations.from(field),
});
