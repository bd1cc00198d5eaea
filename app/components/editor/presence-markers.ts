// Co-authors in the text, drawn our own way: a thin caret and a tinted selection in each person's
// colour, and their initials on a flag in a gutter of its own, beside the line the caret is on.
// The flag never sits over text, so it cannot hide what its author just typed; it fades a few
// seconds after their caret last moved (PeerActivity) and comes back when it moves again.
// This client's own caret is published in the awareness `cursor` field as Yjs relative
// positions, the shape y-codemirror.next reads, so any client of the room understands it.
import { type Extension, RangeSet, RangeSetBuilder, StateEffect, StateField } from "@codemirror/state";
import { Decoration, type DecorationSet, EditorView, gutter, GutterMarker, ViewPlugin, type ViewUpdate, WidgetType } from "@codemirror/view";
import type { Awareness } from "y-protocols/awareness";
import * as Y from "yjs";
import { initials } from "~/components/presence";
import { readPresence } from "~/shared/room-document";
import { PeerActivity } from "./peer-activity";

/** One co-author's caret as drawn: positions in the current text. */
interface PeerCaret {
  clientId: number;
  name: string;
  colour: string;
  anchor: number;
  head: number;
  /** Whether their flag shows (their caret moved a moment ago). */
  active: boolean;
}

const setPeerCarets = StateEffect.define<PeerCaret[]>();

interface Drawn {
  carets: PeerCaret[];
  marks: DecorationSet;
  flags: RangeSet<GutterMarker>;
}

/** The carets as last read from the awareness, moved along with every change of the text since. */
const peerCarets = StateField.define<Drawn>({
  create: () => ({ carets: [], marks: Decoration.none, flags: RangeSet.empty }),
  update(drawn, transaction) {
    let carets = drawn.carets;
    for (const effect of transaction.effects) if (effect.is(setPeerCarets)) carets = effect.value;
    if (carets === drawn.carets && !transaction.docChanged) return drawn;
    if (carets === drawn.carets) {
      const { changes } = transaction;
      carets = carets.map((caret) => ({ ...caret, anchor: changes.mapPos(caret.anchor), head: changes.mapPos(caret.head) }));
    }
    return draw(carets, transaction.state.doc);
  },
  provide: (field) => EditorView.decorations.from(field, (drawn) => drawn.marks),
});

function draw(carets: PeerCaret[], doc: { length: number; lineAt(pos: number): { from: number } }): Drawn {
  const inside = carets.filter(({ anchor, head }) => Math.max(anchor, head) <= doc.length);
  const marks = inside.flatMap(({ clientId, name, colour, anchor, head }) => [
    ...(anchor === head
      ? []
      : [Decoration.mark({ class: "cm-mwPeerSelection", attributes: { style: `background-color: ${colour}33` } }).range(Math.min(anchor, head), Math.max(anchor, head))]),
    // Outside the selection it ends, as the own caret is drawn.
    Decoration.widget({ widget: new CaretWidget(clientId, name, colour), side: head > anchor ? -1 : 1 }).range(head),
  ]);
  const byLine = new Map<number, PeerCaret[]>();
  for (const caret of inside) {
    const line = doc.lineAt(caret.head).from;
    byLine.set(line, [...(byLine.get(line) ?? []), caret]);
  }
  const flags = new RangeSetBuilder<GutterMarker>();
  for (const line of [...byLine.keys()].sort((a, b) => a - b)) flags.add(line, line, new FlagMarker(byLine.get(line)!));
  return { carets: inside, marks: Decoration.set(marks, true), flags: flags.finish() };
}

class CaretWidget extends WidgetType {
  constructor(
    readonly clientId: number,
    readonly name: string,
    readonly colour: string,
  ) {
    super();
  }

  eq(other: CaretWidget) {
    return other.clientId === this.clientId && other.colour === this.colour && other.name === this.name;
  }

  toDOM() {
    const caret = document.createElement("span");
    caret.className = "cm-mwPeerCaret";
    caret.style.borderLeftColor = this.colour;
    caret.title = this.name;
    caret.dataset.peer = this.name;
    // A word joiner gives the inline caret the line's height without letting the line break there.
    caret.textContent = "\u2060";
    return caret;
  }

  ignoreEvent() {
    return true;
  }
}

/** The flags of everyone whose caret is on one line. */
class FlagMarker extends GutterMarker {
  constructor(readonly carets: readonly PeerCaret[]) {
    super();
  }

  eq(other: FlagMarker) {
    return (
      other.carets.length === this.carets.length &&
      other.carets.every((caret, index) => {
        const mine = this.carets[index];
        return caret.clientId === mine.clientId && caret.name === mine.name && caret.colour === mine.colour && caret.active === mine.active;
      })
    );
  }

  toDOM() {
    const flags = document.createElement("span");
    flags.className = "cm-mwPeerFlags";
    for (const { name, colour, active } of this.carets) {
      const flag = document.createElement("span");
      flag.className = active ? "cm-mwPeerFlag" : "cm-mwPeerFlag cm-mwPeerFlag-idle";
      flag.style.backgroundColor = colour;
      flag.title = name;
      flag.dataset.peer = name;
      flag.dataset.idle = String(!active);
      flag.setAttribute("aria-label", `${name} is here`);
      flag.textContent = initials(name);
      flags.append(flag);
    }
    return flags;
  }
}

const spacerFlag = new FlagMarker([{ clientId: 0, name: "Mm", colour: "transparent", anchor: 0, head: 0, active: true }]);

/** Reads the room's awareness into the field, publishes this client's caret, and fades flags on time. */
function awarenessBridge(source: Y.Text, awareness: Awareness) {
  return ViewPlugin.define((view) => {
    const activity = new PeerActivity();
    let fade: ReturnType<typeof setTimeout> | undefined;
    let destroyed = false;

    const read = () => {
      if (destroyed) return;
      const doc = source.doc!;
      const now = Date.now();
      const carets: PeerCaret[] = [];
      const seen = new Map<number, string>();
      awareness.getStates().forEach((state, clientId) => {
        if (clientId === awareness.clientID) return;
        const { user } = readPresence(state);
        const cursor = state.cursor as { anchor?: unknown; head?: unknown } | null | undefined;
        if (!user || !cursor?.anchor || !cursor.head) return;
        const anchor = Y.createAbsolutePositionFromRelativePosition(Y.createRelativePositionFromJSON(cursor.anchor), doc);
        const head = Y.createAbsolutePositionFromRelativePosition(Y.createRelativePositionFromJSON(cursor.head), doc);
        if (anchor?.type !== source || head?.type !== source) return;
        // The relative position stays on the character after the caret while its author types
        // before it, so the caret's column tells typing apart from standing still.
        const line = view.state.doc.lineAt(Math.min(head.index, view.state.doc.length));
        seen.set(clientId, `${JSON.stringify(cursor)}@${head.index - line.from}`);
        carets.push({ clientId, name: user.name, colour: user.colour ?? "#715cc0", anchor: anchor.index, head: head.index, active: false });
      });
      activity.see(seen, now);
      for (const caret of carets) caret.active = activity.isActive(caret.clientId, now);
      view.dispatch({ effects: setPeerCarets.of(carets) });
      clearTimeout(fade);
      const next = activity.nextIdleIn(now);
      if (next !== null) fade = setTimeout(read, next);
    };

    // Only others' changes are read: this client's own caret is published from inside an update,
    // where a dispatch is not allowed.
    const onChange = ({ added, updated, removed }: { added: number[]; updated: number[]; removed: number[] }) => {
      if ([...added, ...updated, ...removed].some((id) => id !== awareness.clientID)) read();
    };
    // A co-author's typing reaches the text before (or after) their caret's message: read again
    // once it has, outside the update that applies it.
    const onText = (_event: Y.YTextEvent, transaction: Y.Transaction) => {
      if (!transaction.local) queueMicrotask(read);
    };
    awareness.on("change", onChange);
    source.observe(onText);
    queueMicrotask(read);

    return {
      update(update: ViewUpdate) {
        publishOwnCaret(update, source, awareness);
      },
      destroy() {
        destroyed = true;
        clearTimeout(fade);
        awareness.off("change", onChange);
        source.unobserve(onText);
      },
    };
  });
}

function publishOwnCaret(update: ViewUpdate, source: Y.Text, awareness: Awareness) {
  const local = awareness.getLocalState();
  if (!local) return;
  const focused = update.view.hasFocus && update.view.dom.ownerDocument.hasFocus();
  if (!focused) return;
  const { anchor, head } = update.state.selection.main;
  const next = { anchor: Y.createRelativePositionFromTypeIndex(source, anchor), head: Y.createRelativePositionFromTypeIndex(source, head) };
  const current = local.cursor as { anchor: unknown; head: unknown } | null | undefined;
  const same =
    current &&
    Y.compareRelativePositions(Y.createRelativePositionFromJSON(current.anchor), next.anchor) &&
    Y.compareRelativePositions(Y.createRelativePositionFromJSON(current.head), next.head);
  if (!same) awareness.setLocalStateField("cursor", next);
}

const presenceTheme = EditorView.baseTheme({
  ".cm-mwPeerCaret": {
    position: "relative",
    borderLeft: "2px solid",
    marginLeft: "-1px",
    marginRight: "-1px",
  },
  ".cm-mwPeerGutter .cm-gutterElement": { padding: "0 2px 0 6px" },
  ".cm-mwPeerFlags": { display: "inline-flex", gap: "2px", verticalAlign: "middle" },
  ".cm-mwPeerFlag": {
    display: "inline-block",
    minWidth: "2.1em",
    padding: "0 3px",
    borderRadius: "3px 0 0 3px",
    color: "white",
    fontSize: "10px",
    fontWeight: "600",
    lineHeight: "1.6",
    textAlign: "center",
    userSelect: "none",
  },
  ".cm-mwPeerFlag-idle": { animation: "cm-mwPeerFlagFade 0.6s ease-out forwards" },
  "@keyframes cm-mwPeerFlagFade": { from: { opacity: 1 }, to: { opacity: 0, visibility: "hidden" } },
  "@media (prefers-reduced-motion: reduce)": { ".cm-mwPeerFlag-idle": { animation: "none", visibility: "hidden" } },
});

/** Co-authors' carets, selections and name flags, and this client's caret sent to them. */
export function presenceMarkers(source: Y.Text, awareness: Awareness): Extension {
  return [
    peerCarets,
    awarenessBridge(source, awareness),
    gutter({ class: "cm-mwPeerGutter", markers: (view) => view.state.field(peerCarets).flags, initialSpacer: () => spacerFlag }),
    presenceTheme,
  ];
}
