// Replacing the whole shared text (an API write, a restore) as the smallest single edit: keep the
// common prefix and suffix, so co-authors' cursors and concurrent edits elsewhere survive.
import type * as Y from "yjs";

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

