// Awareness (presence: who is here, their cursor and selection) is allowed for every role, but a
// connection may speak only for its own awareness clients and only under its own name: the
// server stamps the name and role it authenticated into `user`, so presence cannot impersonate.
import * as decoding from "lib0/decoding";
import * as encoding from "lib0/encoding";
import { stampPresence } from "../../app/shared/room-document";
import type { Role } from "../../app/shared/roles";

/** A caret, a selection and the user's details take a few hundred characters. */
export const MAX_STATE_CHARS = 4 * 1024;
/** A browser tab speaks for one awareness client; a few more allow for a remount mid-handshake. */
export const MAX_CLIENTS_PER_CONNECTION = 4;
const utf8 = new TextDecoder("utf-8", { fatal: true });

interface AwarenessEntry {
  clientId: number;
  clock: number;
  state: Record<string, unknown> | null;
}

/**
 * The entries for the clients `keep` accepts. Others are skipped unread: a browser's provider
 * sends back every presence change it receives, so a class joining would otherwise have each
 * editor's echo of the whole class decoded and parsed only to be dropped.
 */
function decodeEntries(update: Uint8Array, keep: (clientId: number) => boolean): AwarenessEntry[] {
  const decoder = decoding.createDecoder(update);
  const entries: AwarenessEntry[] = [];
  const count = decoding.readVarUint(decoder);
  for (let i = 0; i < count; i++) {
    const clientId = decoding.readVarUint(decoder);
    const clock = decoding.readVarUint(decoder);
    const bytes = decoding.readVarUint8Array(decoder);
    if (!keep(clientId)) continue;
    const json = utf8.decode(bytes);
    if (json.length > MAX_STATE_CHARS) throw new Error("awareness state too large");
    const state: unknown = JSON.parse(json);
    if (state !== null && (typeof state !== "object" || Array.isArray(state))) throw new Error("awareness state is not an object");
    entries.push({ clientId, clock, state: state as AwarenessEntry["state"] });
  }
  return entries;
}

function encodeEntries(entries: AwarenessEntry[]): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, entries.length);
  for (const entry of entries) {
    encoding.writeVarUint(encoder, entry.clientId);
    encoding.writeVarUint(encoder, entry.clock);
    encoding.writeVarString(encoder, JSON.stringify(entry.state));
  }
  return encoding.toUint8Array(encoder);
}

export interface PresenceSpeaker {
  name: string;
  role: Role;
  /** False when another connection in the room already speaks for this awareness client. */
  mayControl(clientId: number): boolean;
}

/**
 * The presence a connection may send per second, in bytes of vetted updates: a caret moving with
 * every keystroke of a fast typist (≈300 bytes each) stays far within; a stream of large states
 * does not. Over budget, updates are dropped, not queued.
 */
export class PresenceBudget {
  private available: number;
  private refilledAt: number;

  constructor(
    private readonly bytesPerSecond = 8 * 1024,
    private readonly burstBytes = 16 * 1024,
    private readonly clock = () => performance.now(),
  ) {
    this.available = burstBytes;
    this.refilledAt = clock();
  }

  take(bytes: number): boolean {
    const now = this.clock();
    this.available = Math.min(this.burstBytes, this.available + ((now - this.refilledAt) / 1000) * this.bytesPerSecond);
    this.refilledAt = now;
    if (bytes > this.available) return false;
    this.available -= bytes;
    return true;
  }
}

/**
 * The part of an awareness update this connection may send, with its identity stamped in, and
 * the client ids it covers; null when nothing is left or the update is malformed.
 */
export function vetAwarenessUpdate(update: Uint8Array, speaker: PresenceSpeaker): { update: Uint8Array; clientIds: number[] } | null {
  let entries: AwarenessEntry[];
  try {
    entries = decodeEntries(update, (clientId) => speaker.mayControl(clientId));
  } catch {
    return null;
  }
  const allowed = entries.map((entry) => (entry.state === null ? entry : { ...entry, state: stampPresence(entry.state, speaker) }));
  if (allowed.length === 0) return null;
  return { update: encodeEntries(allowed), clientIds: allowed.map((e) => e.clientId) };
}

/**
 * Which member speaks for each awareness client of a room, kept in one place: a client id is
 * claimed by the first member whose presence names it and stays theirs until they leave, and a
 * member claims at most MAX_CLIENTS_PER_CONNECTION.
 */
export class PresenceOwners<Member> {
  private readonly ownerOf = new Map<number, Member>();
  private readonly clientsOf = new Map<Member, Set<number>>();

  /** A `mayControl` test for one update of `member`: it counts the new clients the update claims. */
  mayControl(member: Member): (clientId: number) => boolean {
    const own = this.clientsOf.get(member);
    let claimed = own?.size ?? 0;
    return (clientId) => {
      if ((this.ownerOf.get(clientId) ?? member) !== member) return false;
      if (own?.has(clientId)) return true;
      return ++claimed <= MAX_CLIENTS_PER_CONNECTION;
    };
  }

  claim(member: Member, clientIds: number[]) {
    let own = this.clientsOf.get(member);
    if (!own) this.clientsOf.set(member, (own = new Set()));
    for (const clientId of clientIds) {
      this.ownerOf.set(clientId, member);
      own.add(clientId);
    }
  }

  /** Forgets these clients of the member (others' claims stay). */
  releaseClients(member: Member, clientIds: number[]) {
    const own = this.clientsOf.get(member);
    for (const clientId of clientIds) {
      if (this.ownerOf.get(clientId) !== member) continue;
      this.ownerOf.delete(clientId);
      own?.delete(clientId);
    }
  }

  /** Forgets the member; returns the clients it spoke for, whose states the room removes. */
  release(member: Member): number[] {
    const own = [...(this.clientsOf.get(member) ?? [])];
    this.clientsOf.delete(member);
    for (const clientId of own) if (this.ownerOf.get(clientId) === member) this.ownerOf.delete(clientId);
    return own;
  }
}
