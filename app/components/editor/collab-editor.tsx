// The shared mechanism text: CodeMirror bound to the room's `source` Y.Text, with co-authors'
// carets and name flags (presence-markers.ts), the mechanism language, live diagnostics, completion and undo of one's own edits only.
import { autocompletion, closeBrackets, closeBracketsKeymap, completionKeymap } from "@codemirror/autocomplete";
import { defaultKeymap } from "@codemirror/commands";
import { bracketMatching, foldGutter, foldKeymap } from "@codemirror/language";
import { lintGutter, lintKeymap } from "@codemirror/lint";
import { highlightSelectionMatches, searchKeymap } from "@codemirror/search";
import { EditorState, type Extension } from "@codemirror/state";
import {
  drawSelection,
  EditorView,
  highlightActiveLine,
  highlightActiveLineGutter,
  highlightSpecialChars,
  keymap,
  lineNumbers,
} from "@codemirror/view";
import { type Ref, useEffect, useImperativeHandle, useRef, useState } from "react";
import { yCollab, yUndoManagerKeymap } from "y-codemirror.next";
import type { Awareness } from "y-protocols/awareness";
import * as Y from "yjs";
import { mechanismLinter } from "~/editor/lint";
import { mechanism } from "~/editor/mechanism-language";
import { editorTheme } from "./editor-theme";
import type { RoomNotice } from "~/utils/use-room";
import { type CaretStep, caretStepListener } from "./caret-step";
import { linkedRanges, showLinkedRanges, type TextRange } from "./linked-ranges";
import { presenceMarkers } from "./presence-markers";
import { textLimits } from "./text-limits";

export type { TextRange } from "./linked-ranges";

export interface CollabEditorHandle {
  /** Points out the given ranges of the text (e.g. the steps behind a graph node); [] clears. */
  highlight(ranges: readonly TextRange[]): void;
  focus(): void;
}

export interface CollabEditorProps {
  /** The room's `source` text; null until the room exists in the browser. */
  source: Y.Text | null;
  awareness: Awareness | null;
  /** Viewers follow the text live but cannot change it. */
  readOnly: boolean;
  ref?: Ref<CollabEditorHandle>;
  className?: string;
  label?: string;
  /** The room's latest refusal of an edit, shown like the editor's own. */
  notice?: RoomNotice | null;
  /** Hears which step the caret is in whenever that changes (the graph lights it up). */
  onCaretStep?: (step: CaretStep | null) => void;
}

export function CollabEditor({ source, awareness, readOnly, ref, className, label = "Mechanism text", notice, onCaretStep }: CollabEditorProps) {
  // Read through a ref, so a new callback each render does not rebuild the editor.
  const caretListener = useRef(onCaretStep);
  caretListener.current = onCaretStep;
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<EditorView | null>(null);
  // Why the last change was refused or altered, until dismissed or the next one.
  const [message, setMessage] = useState<string | null>(null);

  useEffect(() => {
    if (notice) setMessage(notice.message);
  }, [notice]);

  // Built in an effect, so the editor exists only in the browser; server rendering sends the host.
  useEffect(() => {
    if (!source || !host.current) return;
    // Undo covers this client's own edits, never a co-author's, and a viewer has none.
    const undoManager = readOnly ? false : new Y.UndoManager(source);
    const editor = new EditorView({
      parent: host.current,
      state: EditorState.create({
        doc: source.toString(),
        extensions: [
          editorExtensions({ source, awareness, undoManager, readOnly, label, notify: setMessage }),
          caretStepListener((step) => caretListener.current?.(step)),
        ],
      }),
    });
    view.current = editor;
    return () => {
      editor.destroy();
      if (undoManager) undoManager.destroy();
      view.current = null;
    };
  }, [source, awareness, readOnly, label]);

  useImperativeHandle(
    ref,
    () => ({
      highlight: (ranges) => {
        if (view.current) showLinkedRanges(view.current, ranges);
      },
      focus: () => view.current?.focus(),
    }),
    [],
  );

  return (
    <>
      {message && (
        <p className="notice-error m-2 flex items-center justify-between gap-3" role="alert" data-testid="editor-notice">
          <span>{message}</span>
          <button type="button" className="btn" onClick={() => setMessage(null)}>
            Dismiss
          </button>
        </p>
      )}
      <div ref={host} className={className} data-testid="collab-editor" data-readonly={readOnly || undefined} />
    </>
  );
}

interface EditorSetup {
  source: Y.Text;
  awareness: Awareness | null;
  undoManager: Y.UndoManager | false;
  readOnly: boolean;
  label: string;
  notify(message: string): void;
}

function editorExtensions({ source, awareness, undoManager, readOnly, label, notify }: EditorSetup): Extension[] {
  return [
    lineNumbers(),
    foldGutter(),
    lintGutter(),
    highlightActiveLineGutter(),
    highlightSpecialChars(),
    drawSelection(),
    // Long comments wrap instead of scrolling sideways, which would hide the start of every step.
    EditorView.lineWrapping,
    // A viewer has no caret of their own, so a lit "current" line would only mislead.
    readOnly ? [] : highlightActiveLine(),
    highlightSelectionMatches(),
    bracketMatching(),
    closeBrackets(),
    // A few screens of the list at a time (its "···" ends, clicked or arrowed past, bring the
    // rest): at 500 steps a name matches over a hundred others, and laying out all of them held
    // up the keystroke that opened the list.
    autocompletion({ maxRenderedOptions: 30 }),
    mechanism(),
    mechanismLinter,
    linkedRanges,
    textLimits(notify),
    editorTheme,
    // Without the awareness, y-codemirror.next only syncs the text and undo; co-authors are drawn
    // by presenceMarkers, whose flags keep off the text the library's labels would cover.
    yCollab(source, null, { undoManager }),
    awareness ? presenceMarkers(source, awareness) : [],
    keymap.of([
      ...closeBracketsKeymap,
      ...(undoManager ? yUndoManagerKeymap : []),
      ...defaultKeymap,
      ...searchKeymap,
      ...foldKeymap,
      ...completionKeymap,
      ...lintKeymap,
    ]),
    EditorState.readOnly.of(readOnly),
    EditorView.editable.of(!readOnly),
    EditorView.contentAttributes.of({ "aria-label": label }),
  ];
}
