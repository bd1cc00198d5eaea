// Edits at known places of the shared text (fitted values, and putting the old ones back), applied
// the same way by the server and the page: last first, so earlier offsets stay true.
import type * as Y from "yjs";
import type { TextEdit } from "~/chem/declared-values";

/** Edits in text order; call inside one transaction so they travel as one update. */
export function applyTextEdits(text: Y.Text, edits: readonly TextEdit[]) {
  for (const edit of [...edits].reverse()) {
    if (edit.to > edit.from) text.delete(edit.from, edit.to - edit.from);
    if (edit.insert.length > 0) text.insert(edit.from, edit.insert);
  }
}
