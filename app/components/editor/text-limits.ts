// The text's rules, kept in the editor before a change reaches the shared document: the server
// would refuse a text over 1 MiB (and the client would then have to resync, losing what was typed
// meanwhile), and PostgreSQL's text cannot hold NUL. Only this user's own changes are filtered;
// co-authors' edits arrive through Yjs already accepted by the server.
import { ChangeSet, EditorState, StateField, type Extension, type Text, type Transaction } from "@codemirror/state";
import { ySyncAnnotation } from "y-codemirror.next";
import { refusalReasons } from "~/shared/room-refusal";
import { MAX_SOURCE_BYTES } from "~/chem/limits";

export const NUL_REMOVED = "NUL characters were removed from the inserted text.";

const encoder = new TextEncoder();

/** UTF-8 length of a string, as PostgreSQL and the server count it (a lone surrogate is 3 bytes). */
export function utf8Bytes(text: string): number {
  return encoder.encode(text).length;
}

/** The change in UTF-8 size, read from the changed ranges only. */
function byteDelta(before: Text, changes: ChangeSet): number {
  let delta = 0;
  changes.iterChanges((fromA, toA, _fromB, _toB, inserted) => {
    delta += utf8Bytes(inserted.toString()) - utf8Bytes(before.sliceString(fromA, toA));
  });
  return delta;
}

/** The text's size in bytes, counted once and then kept up to date change by change. */
const textBytes = StateField.define<number>({
  create: (state) => utf8Bytes(state.doc.toString()),
  update: (bytes, tr) => (tr.docChanged ? bytes + byteDelta(tr.startState.doc, tr.changes) : bytes),
});

/** Deletions of the NULs this transaction inserts, as a change of its new document. */
function nulRemoval(tr: Transaction): ChangeSet | null {
  const removals: { from: number; to: number }[] = [];
  tr.changes.iterChanges((_fromA, _toA, fromB, _toB, inserted) => {
    const text = inserted.toString();
    for (let at = text.indexOf("\0"); at !== -1; at = text.indexOf("\0", at + 1)) removals.push({ from: fromB + at, to: fromB + at + 1 });
  });
  return removals.length === 0 ? null : ChangeSet.of(removals, tr.newDoc.length);
}

export function textLimits(notify: (message: string) => void, maxBytes = MAX_SOURCE_BYTES): Extension {
  return [
    textBytes,
    EditorState.transactionFilter.of((tr) => {
      if (!tr.docChanged || tr.annotation(ySyncAnnotation) !== undefined) return tr;
      const removal = nulRemoval(tr);
      const changes = removal ? tr.changes.compose(removal) : tr.changes;
      if (tr.startState.field(textBytes) + byteDelta(tr.startState.doc, changes) > maxBytes) {
        notify(refusalReasons["text-too-large"]);
        return [];
      }
      if (!removal) return tr;
      notify(NUL_REMOVED);
      return { changes, selection: tr.newSelection.map(removal), effects: tr.effects, scrollIntoView: tr.scrollIntoView };
    }),
  ];
}
