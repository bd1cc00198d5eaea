// What an editor's document update may write, decided before it is applied (Yjs cannot take an
// applied update back). The shared document holds exactly two client-written types: the `source`
// text (plain strings without NUL, which PostgreSQL's text cannot store) and the `layout` map (a
// bounded number of positions of finite numbers); `analysis` is written by the server alone.
// The work is proportional to the update, never to the document: each new item's place is read
// from its parent name, or from its origin, which is in the update or already in the document.
import * as Y from "yjs";
import { layoutMap, MAX_LAYOUT_KEY_CHARS, MAX_LAYOUT_KEYS, rootKeys, roomKeys, writtenLayoutPosition, type RoomKey } from "../../app/shared/room-document";
import type { RefusalReason } from "../../app/shared/room-refusal";

/** Where an item lands: a root type and map key, or somewhere no update may write. */
type Place = { root: string; key: string | null } | "nested" | "missing" | "discarded";

interface Entry {
  struct: Y.Item | Y.GC;
  /** Known from the start for collected content (GC): it carries nothing. */
  place?: Place;
}

const isPosition = (value: unknown): boolean => writtenLayoutPosition.safeParse(value).success;

export class UpdateCheck {
  private readonly roots: Map<unknown, RoomKey>;

  constructor(private readonly doc: Y.Doc) {
    this.roots = rootKeys(doc);
  }

  /** Null when the update may be applied; otherwise why not. Throws on an unreadable update. */
  refusal(update: Uint8Array): RefusalReason | null {
    const { structs } = Y.decodeUpdate(update);
    const byClient = new Map<number, Entry[]>();
    const fresh: Entry[] = [];
    for (const struct of structs) {
      if (struct instanceof Y.Skip) return "out-of-step";
      const known = Y.getState(this.doc.store, struct.id.client);
      const entries = byClient.get(struct.id.client);
      // A gap before a client's first new struct means edits the server never accepted.
      if (!entries && struct.id.clock > known) return "out-of-step";
      // Yjs also drops what is inserted next to collected content.
      const entry: Entry = struct instanceof Y.Item ? { struct } : { struct, place: "discarded" };
      if (!entries) byClient.set(struct.id.client, [entry]);
      else entries.push(entry);
      if (struct instanceof Y.Item && struct.id.clock + struct.length > known) fresh.push(entry);
    }
    const newLayoutKeys = new Set<string>();
    const layout = layoutMap(this.doc);
    for (const entry of fresh) {
      const place = this.placeOf(entry, byClient);
      if (place === "discarded") continue;
      if (place === "missing") return "out-of-step";
      if (place === "nested") return "shape";
      // Content deleted in the same update still names its parent and key, which are stored.
      const { content } = entry.struct as Y.Item;
      const deleted = content instanceof Y.ContentDeleted;
      if (place.root === roomKeys.source) {
        if (place.key !== null) return "shape";
        if (deleted) continue;
        if (!(content instanceof Y.ContentString)) return "shape";
        if (content.str.includes("\0")) return "nul-character";
      } else if (place.root === roomKeys.layout) {
        if (place.key === null || place.key.length > MAX_LAYOUT_KEY_CHARS) return "shape";
        if (deleted) continue;
        if (!(content instanceof Y.ContentAny) || !content.arr.every(isPosition)) return "shape";
        if (!layout.has(place.key)) newLayoutKeys.add(place.key);
      } else return "shape";
    }
    if (newLayoutKeys.size > 0 && layout.size + newLayoutKeys.size > MAX_LAYOUT_KEYS) return "shape";
    return null;
  }

  /** Follows origins (iteratively: a chain may be long) to the parent the item will join. */
  private placeOf(start: Entry, byClient: Map<number, Entry[]>): Place {
    const chain = new Set<Entry>();
    let entry = start;
    let place: Place;
    for (;;) {
      if (entry.place) {
        place = entry.place;
        break;
      }
      if (chain.has(entry)) {
        place = "missing";
        break;
      }
      chain.add(entry);
      const { parent, parentSub, origin, rightOrigin } = entry.struct as Y.Item;
      if (typeof parent === "string") {
        place = { root: parent, key: parentSub };
        break;
      }
      if (parent) {
        place = "nested";
        break;
      }
      const neighbour = origin ?? rightOrigin;
      if (!neighbour) {
        place = "missing";
        break;
      }
      const local = findEntry(byClient.get(neighbour.client), neighbour.clock);
      if (local) {
        entry = local;
        continue;
      }
      place = this.placeInDocument(neighbour);
      break;
    }
    for (const visited of chain) visited.place = place;
    return place;
  }

  private placeInDocument(id: Y.ID): Place {
    const structs = this.doc.store.clients.get(id.client);
    if (!structs || id.clock >= Y.getState(this.doc.store, id.client)) return "missing";
    const struct = structs[Y.findIndexSS(structs, id.clock)];
    // Next to collected content, Yjs drops the new item too.
    if (!(struct instanceof Y.Item)) return "discarded";
    const root = this.roots.get(struct.parent);
    return root ? { root, key: struct.parentSub } : "nested";
  }
}

function findEntry(entries: Entry[] | undefined, clock: number): Entry | undefined {
  if (!entries) return undefined;
  let low = 0;
  let high = entries.length - 1;
  while (low <= high) {
    const middle = (low + high) >> 1;
    const { id, length } = entries[middle].struct;
    if (clock < id.clock) high = middle - 1;
    else if (clock >= id.clock + length) low = middle + 1;
    else return entries[middle];
  }
  return undefined;
}
