// Tells the page which step the caret is in, read from the syntax tree the editor keeps anyway
// (parsed incrementally), so a caret move costs a walk up from one leaf and no reparse. The page
// hears only when the answer changes.
import { syntaxTree } from "@codemirror/language";
import type { EditorState } from "@codemirror/state";
import { EditorView } from "@codemirror/view";
import type { SyntaxNode } from "@lezer/common";

export interface CaretStep {
  /** The step's label, null when it has none. */
  label: string | null;
  /** 1-based line where the step starts. */
  line: number;
}

/** The step around the main caret, or null when the caret is elsewhere. */
export function caretStep(state: EditorState): CaretStep | null {
  const head = state.selection.main.head;
  for (let node: SyntaxNode | null = syntaxTree(state).resolveInner(head, -1); node; node = node.parent) {
    if (node.name !== "Step") continue;
    const label = node.getChild("Label");
    return { label: label ? state.sliceDoc(label.from, label.to).trim() : null, line: state.doc.lineAt(node.from).number };
  }
  return null;
}

export function caretStepListener(onChange: (step: CaretStep | null) => void) {
  let last: CaretStep | null = null;
  return EditorView.updateListener.of((update) => {
    if (!update.selectionSet && !update.docChanged && !update.focusChanged) return;
    const next = caretStep(update.state);
    if (next?.label === last?.label && next?.line === last?.line) return;
    last = next;
    onChange(next);
  });
}
