// The editor's look in Mechweave's palette. Every colour is a theme variable, so one theme serves
// light and dark: switching `data-theme` on <html> recolours the editor without reconfiguring it.
import { HighlightStyle, syntaxHighlighting } from "@codemirror/language";
import { EditorView } from "@codemirror/view";
import { tags as t } from "@lezer/highlight";

const mono = '"Plex Mono", ui-monospace, monospace';
const sans = '"Plex Sans", ui-sans-serif, system-ui, sans-serif';

const mechanismHighlightStyle = HighlightStyle.define([
  { tag: t.variableName, color: "var(--mw-ink)", fontWeight: "500" },
  { tag: t.constant(t.variableName), color: "var(--mw-accent)", fontWeight: "400" },
  { tag: t.labelName, color: "var(--mw-muted)", fontWeight: "500" },
  { tag: [t.number, t.atom], color: "var(--mw-signal)" },
  { tag: t.operator, color: "color-mix(in oklab, var(--mw-accent) 55%, var(--mw-ink))", fontWeight: "500" },
  { tag: t.keyword, color: "var(--mw-accent)", fontWeight: "600" },
  { tag: t.special(t.string), color: "color-mix(in oklab, var(--mw-signal) 60%, var(--mw-ink))", fontStyle: "italic" },
  { tag: t.lineComment, color: "var(--mw-muted)", fontStyle: "italic" },
  { tag: [t.separator, t.squareBracket, t.brace], color: "var(--mw-muted)" },
]);

const editorChrome = EditorView.theme({
  "&": { backgroundColor: "var(--mw-surface)", color: "var(--mw-ink)", fontSize: "14px", height: "100%" },
  "&.cm-focused": { outline: "none" },
  ".cm-scroller": { fontFamily: mono, lineHeight: "1.65" },
  ".cm-content": { caretColor: "var(--mw-accent)", padding: "14px 0 10px" },
  ".cm-cursor, .cm-dropCursor": { borderLeftColor: "var(--mw-accent)", borderLeftWidth: "2px" },
  "&.cm-focused > .cm-scroller > .cm-selectionLayer .cm-selectionBackground, .cm-selectionBackground, .cm-content ::selection": {
    backgroundColor: "color-mix(in oklab, var(--mw-accent) 24%, transparent)",
  },
  ".cm-activeLine": { backgroundColor: "color-mix(in oklab, var(--mw-accent-soft) 50%, transparent)" },
  ".cm-gutters": { backgroundColor: "var(--mw-surface)", color: "var(--mw-muted)", borderRight: "1px solid var(--mw-line)" },
  ".cm-activeLineGutter": { backgroundColor: "transparent", color: "var(--mw-ink)" },
  ".cm-lineNumbers .cm-gutterElement": { padding: "0 10px 0 14px", fontSize: "12px" },
  ".cm-foldGutter .cm-gutterElement": { color: "var(--mw-muted)", padding: "0 4px" },
  ".cm-foldPlaceholder": {
    backgroundColor: "var(--mw-accent-soft)",
    border: "none",
    color: "var(--mw-accent)",
    padding: "0 6px",
    borderRadius: "4px",
  },
  "&.cm-focused .cm-matchingBracket, .cm-matchingBracket": {
    backgroundColor: "var(--mw-accent-soft)",
    color: "var(--mw-accent)",
    outline: "1px solid color-mix(in oklab, var(--mw-accent) 45%, transparent)",
  },
  "&.cm-focused .cm-nonmatchingBracket, .cm-nonmatchingBracket": { backgroundColor: "var(--mw-danger-soft)", color: "var(--mw-danger)" },

  // Diagnostics in the theme's danger and signal colours instead of the stock underline images.
  ".cm-lintRange": { backgroundImage: "none", textDecorationLine: "underline", textDecorationStyle: "wavy", textUnderlineOffset: "3px" },
  ".cm-lintRange-error": { textDecorationColor: "var(--mw-danger)" },
  ".cm-lintRange-warning": { textDecorationColor: "var(--mw-signal)" },
  ".cm-lintPoint-error:after": { borderBottomColor: "var(--mw-danger)" },
  ".cm-lintPoint-warning:after": { borderBottomColor: "var(--mw-signal)" },
  // Gutter markers as plain dots in the theme colours; the stock icons carry fixed colours.
  ".cm-lint-marker": { width: "0.55em", height: "0.55em", borderRadius: "50%", margin: "0.45em auto 0" },
  ".cm-lint-marker-error": { content: "none", backgroundColor: "var(--mw-danger)" },
  ".cm-lint-marker-warning": { content: "none", backgroundColor: "var(--mw-signal)" },
  ".cm-diagnostic": { fontFamily: sans, fontSize: "13px", padding: "4px 8px", borderLeftWidth: "3px" },
  ".cm-diagnostic-error": { borderLeftColor: "var(--mw-danger)" },
  ".cm-diagnostic-warning": { borderLeftColor: "var(--mw-signal)" },

  ".cm-tooltip": {
    backgroundColor: "var(--mw-raised)",
    color: "var(--mw-ink)",
    border: "1px solid var(--mw-line)",
    borderRadius: "6px",
    overflow: "hidden",
  },
  ".cm-tooltip.cm-tooltip-autocomplete > ul": { fontFamily: mono, fontSize: "13px" },
  ".cm-tooltip.cm-tooltip-autocomplete > ul > li": { padding: "2px 10px" },
  ".cm-tooltip.cm-tooltip-autocomplete > ul > li[aria-selected]": { backgroundColor: "var(--mw-accent-soft)", color: "var(--mw-ink)" },
  ".cm-completionDetail": { fontFamily: sans, fontStyle: "normal", color: "var(--mw-muted)", marginLeft: "1em" },
  ".cm-completionMatchedText": { textDecoration: "none", color: "var(--mw-accent)", fontWeight: "600" },

  ".cm-panels": { backgroundColor: "var(--mw-raised)", color: "var(--mw-ink)", fontFamily: sans },
  ".cm-panels.cm-panels-bottom": { borderTop: "1px solid var(--mw-line)" },
  ".cm-textfield": {
    backgroundColor: "var(--mw-surface)",
    border: "1px solid var(--mw-line)",
    borderRadius: "4px",
    color: "var(--mw-ink)",
  },
  ".cm-button": {
    backgroundImage: "none",
    backgroundColor: "var(--mw-surface)",
    border: "1px solid var(--mw-line)",
    borderRadius: "4px",
    color: "var(--mw-ink)",
  },
  ".cm-searchMatch": { backgroundColor: "var(--mw-signal-soft)" },
  ".cm-selectionMatch": { backgroundColor: "color-mix(in oklab, var(--mw-accent) 14%, transparent)" },
  ".cm-searchMatch.cm-searchMatch-selected": { outline: "1px solid var(--mw-signal)" },

  ".cm-mwPeerFlag": { fontFamily: sans },
});

export const editorTheme = [editorChrome, syntaxHighlighting(mechanismHighlightStyle)];
