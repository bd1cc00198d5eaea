// CodeMirror support for the `.weave` mechanism language, built on the same Lezer grammar the
// parser uses, so the editor's reading of a line never disagrees with the server's.
import { foldService, LanguageSupport, LRLanguage } from "@codemirror/language";
import type { EditorState } from "@codemirror/state";
import { mechanismHighlighting } from "../../grammar/highlight";
import { parser } from "../../grammar/parser";
import { completeMechanismNames } from "./complete";
import { quoteMatching } from "./quote-matching";

export const mechanismLanguage = LRLanguage.define({
  name: "weave",
  parser: parser.configure({ props: [mechanismHighlighting] }),
  languageData: {
    commentTokens: { line: "#" },
    closeBrackets: { brackets: ["[", "{", '"'] },
    autocomplete: completeMechanismNames,
  },
});

const commentLine = /^\s*#/;

const isCommentLine = (state: EditorState, number: number) =>
  number >= 1 && number <= state.doc.lines && commentLine.test(state.doc.line(number).text);

/**
 * A run of two or more comment lines folds to its first line: authors write long notes above a
 * group of steps, and the grammar has no block node to fold on.
 */
const commentBlockFolding = foldService.of((state, lineStart) => {
  const first = state.doc.lineAt(lineStart);
  if (!isCommentLine(state, first.number) || isCommentLine(state, first.number - 1)) return null;
  let last = first.number;
  while (isCommentLine(state, last + 1)) last++;
  return last === first.number ? null : { from: first.to, to: state.doc.line(last).to };
});

export function mechanism(): LanguageSupport {
  return new LanguageSupport(mechanismLanguage, [commentBlockFolding, quoteMatching]);
}
