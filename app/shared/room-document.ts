// The schema of a room's shared document, for the server that keeps it and the browser that
// edits it: the three root types and what each holds, and the presence (awareness state) each
// client publishes. The `analysis` map's packed report has its codec in analysis-map.ts.
import type * as Y from "yjs";
import { z } from "zod";
import { roles, type Role } from "./roles";

/** The document's root types; an update that writes anywhere else is refused. */
export const roomKeys = {
  /** The mechanism text, plain strings without NUL, written by editors. */
  source: "source",
  /** The server's structure analysis of the text (counts, digest, revision, packed report). */
  analysis: "analysis",
  /** Complex (canonical text) → top-left corner of its box in the graph, written by editors. */
  layout: "layout",
  /**
   * Fit id → `FitNotice`, written by the server when a fit starts and ends. Fits are announced in
   * the document rather than on the instance bus alone: the notice is stored and relayed like every
   * update, so members on any instance, late joiners and sockets that reconnect after a blip all
   * see it; the fit itself (result, data) is read over HTTP.
   */
  fits: "fits",
} as const;

export type RoomKey = (typeof roomKeys)[keyof typeof roomKeys];

export function sourceText(doc: Y.Doc): Y.Text {
  return doc.getText(roomKeys.source);
}

export function analysisMap(doc: Y.Doc): Y.Map<unknown> {
  return doc.getMap(roomKeys.analysis);
}

export function layoutMap(doc: Y.Doc): Y.Map<unknown> {
  return doc.getMap(roomKeys.layout);
}

export function fitsMap(doc: Y.Doc): Y.Map<unknown> {
  return doc.getMap(roomKeys.fits);
}

export const fitNotice = z.object({ status: z.enum(["running", "done", "failed"]), at: z.string(), by: z.string().nullable() });
export type FitNotice = z.infer<typeof fitNotice>;
/** Notices kept in the document; older ones are deleted as new ones arrive (the fits stay in the database). */
export const MAX_FIT_NOTICES = 20;

/** Each root type's key, so the target of a write can be named from the type it joins. */
export function rootKeys(doc: Y.Doc): Map<unknown, RoomKey> {
  return new Map<unknown, RoomKey>([
    [sourceText(doc), roomKeys.source],
    [analysisMap(doc), roomKeys.analysis],
    [layoutMap(doc), roomKeys.layout],
    [fitsMap(doc), roomKeys.fits],
  ]);
}

/** The `layout` map's bounds; clients keep within them, since a refused write costs a resync. */
export const MAX_LAYOUT_KEYS = 5000;
export const MAX_LAYOUT_KEY_CHARS = 256;

/** A position as readers take it: finite numbers (zod's numbers are finite); other fields are ignored. */
export const layoutPosition = z.object({ x: z.number(), y: z.number() });
export type LayoutPosition = z.infer<typeof layoutPosition>;
/** What an editor may write as a value of the `layout` map: exactly `{ x, y }`. */
export const writtenLayoutPosition = layoutPosition.strict();

/** The awareness fields Mechweave uses (the editor adds `cursor`: Yjs relative positions, as y-codemirror.next writes them). */
export const presenceFields = {
  /** Who this client is; the server stamps the name and role it authenticated. */
  user: "user",
  /** The complex (canonical text) this client is dragging in the graph, or null. */
  graphDrag: "graphDrag",
} as const;

/**
 * The `user` field; the editor draws a co-author's caret and flag in `colour`. The schema keeps
 * whatever else a client adds.
 */
export const presenceUser = z.looseObject({
  name: z.string().min(1),
  colour: z.string().min(1).optional(),
  /** Stamped by the server; an unknown one reads as absent rather than hiding the person. */
  role: z.enum(roles).optional().catch(undefined),
});
export type PresenceUser = z.infer<typeof presenceUser>;

export const presence = z.looseObject({
  user: presenceUser.optional(),
  graphDrag: z.string().nullable().optional(),
});
export type Presence = z.infer<typeof presence>;

/** One client's presence, each field read on its own: a malformed field is absent, the others stay. */
export function readPresence(state: Record<string, unknown>): Presence {
  const user = presence.shape.user.safeParse(state[presenceFields.user]);
  const graphDrag = presence.shape.graphDrag.safeParse(state[presenceFields.graphDrag]);
  return { user: user.data, graphDrag: graphDrag.data ?? null };
}

/** The state with the speaker's authenticated name and role in its `user` field: presence cannot impersonate. */
export function stampPresence(state: Record<string, unknown>, speaker: { name: string; role: Role }): Record<string, unknown> {
  const field = state[presenceFields.user];
  const user = typeof field === "object" && field !== null ? field : {};
  return { ...state, [presenceFields.user]: { ...user, name: speaker.name, role: speaker.role } };
}
