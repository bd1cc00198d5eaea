// Replacing the whole shared text (an API write, a restore) as the smallest single edit: keep the
// common prefix and suffix, so co-authors' cursors and concurrent edits elsewhere survive. Edits at
// known places (fitted values) are applied as they are, for the same reason.
import type * as Y from "yjs";
import type { TextEdit } from "../../app/chem/declared-values";

const isHighSurrogate = (code: number) => code >= 0xd800 && code <= 0xdbff;
const isLowSurrogate = (code: number) => code >= 0xdc00 && code <= 0xdfff;

export function replaceText(text: Y.Text, next: string) {
  const current = text.toString();
  if (current === next) return;
  const shorter = Math.min(current.length, next.length);
  let start = 0;
  while (start < shorter && current.charCodeAt(start) === next.charCodeAt(start)) start++;
  // Y.Text counts UTF-16 units; never cut a surrogate pair in two.
  if (start > 0 && isHighSurrogate(current.charCodeAt(start - 1))) start--;
  let end = 0;
  while (end < shorter - start && current.charCodeAt(current.length - 1 - end) === next.charCodeAt(next.length - 1 - end)) end++;
  if (end > 0 && isLowSurrogate(current.charCodeAt(current.length - end))) end--;
  const removed = current.length - start - end;
  if (removed > 0) text.delete(start, removed);
  const inserted = next.slice(start, next.length - end);
  if (inserted.length > 0) text.insert(start, inserted);
}

/** Edits in text order, applied last first so earlier offsets stay true; call inside one transaction. */
export function applyTextEdits(text: Y.Text, edits: readonly TextEdit[]) {
  for (const edit of [...edits].reverse()) {
    if (edit.to > edit.from) text.delete(edit.from, edit.to - edit.from);
    if (edit.insert.length > 0) text.insert(edit.from, edit.insert);
  }
}
