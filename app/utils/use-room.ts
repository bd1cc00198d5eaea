// The live room of one mechanism: a Y.Doc kept in step with the collaboration server over
// y-websocket, this user's presence in it, and the server's latest analysis as React state.
import { useEffect, useState } from "react";
import type { Awareness } from "y-protocols/awareness";
import { WebsocketProvider } from "y-websocket";
import * as Y from "yjs";
import { type RoomAnalysis, type RoomEquations, watchRoomAnalysis, watchRoomEquations } from "~/shared/analysis-map";
import { analysisMap, presenceFields, readPresence } from "~/shared/room-document";
import { MESSAGE_REFUSED, readRefusal } from "~/shared/room-refusal";
import type { Role } from "~/shared/roles";

export type RoomStatus = "connecting" | "online" | "offline";

/** What every client publishes about itself in the room's awareness. */
export interface PeerUser {
  name: string;
  colour: string;
  role: Role;
}

export interface Peer extends PeerUser {
  clientId: number;
}

export interface Room {
  /** Null until mounted in the browser (the room never exists during server rendering). */
  doc: Y.Doc | null;
  provider: WebsocketProvider | null;
  awareness: Awareness | null;
  status: RoomStatus;
  /** True once the server's state of the document has arrived. */
  synced: boolean;
  analysis: RoomAnalysis;
  /** This user as others see them (the colour may have moved off one an earlier peer holds). */
  self: PeerUser;
  /** Everyone else in the room, one entry per connected client. */
  peers: Peer[];
  /** Why the server last refused one of this user's edits; `id` tells a repeat apart. */
  notice: RoomNotice | null;
}

export interface RoomNotice {
  id: number;
  message: string;
}

export interface RoomOptions {
  user: { name: string; colour?: string };
  readOnly: boolean;
  /** Shown to others; defaults to "viewer" when read-only, else "editor". */
  role?: Role;
}

/**
 * Peer colours: ten hues at one luminance (≈0.15), so each reads as a caret on the dark canvas
 * and carries white name-label text at AA contrast on the light one.
 */
export const peerPalette = [
  "#b94548",
  "#a15a16",
  "#826a00",
  "#3a7a2c",
  "#007a68",
  "#007691",
  "#236cc1",
  "#715cc0",
  "#9c4ea1",
  "#b24576",
] as const;

/**
 * A stable colour for a person: their name picks a starting hue, and colours already taken are
 * skipped while any is free, so a room of a few people never shows two alike.
 */
export function pickColour(seed: string, taken: Iterable<string> = []): string {
  const used = new Set(taken);
  let hash = 0;
  for (let i = 0; i < seed.length; i++) hash = (hash * 31 + seed.charCodeAt(i)) >>> 0;
  const start = hash % peerPalette.length;
  for (let step = 0; step < peerPalette.length; step++) {
    const colour = peerPalette[(start + step) % peerPalette.length];
    if (!used.has(colour)) return colour;
  }
  return peerPalette[start];
}

export function useRoom(mechanismId: string, { user, readOnly, role }: RoomOptions): Room {
  const [connection, setConnection] = useState<{ doc: Y.Doc; provider: WebsocketProvider } | null>(null);
  const [status, setStatus] = useState<RoomStatus>("connecting");
  const [synced, setSynced] = useState(false);
  const [analysis, setAnalysis] = useState<RoomAnalysis>({});
  const [peers, setPeers] = useState<Peer[]>([]);
  const [notice, setNotice] = useState<RoomNotice | null>(null);
  // A refused edit cannot be taken out of a Y.Doc, and every later edit builds on it: the room is
  // rejoined with a fresh copy of the server's document instead.
  const [generation, setGeneration] = useState(0);
  const publishedRole: Role = role ?? (readOnly ? "viewer" : "editor");
  const [self, setSelf] = useState<PeerUser>(() => ({
    name: user.name,
    colour: user.colour ?? pickColour(user.name),
    role: publishedRole,
  }));

  // Effects run only in the browser, which is what keeps the socket out of server rendering.
  useEffect(() => {
    const doc = new Y.Doc();
    const scheme = location.protocol === "https:" ? "wss" : "ws";
    const provider = new WebsocketProvider(`${scheme}://${location.host}/collab`, mechanismId, doc, { connect: false });
    // Connecting a tick later lets a mount that is undone at once (React's development double
    // mount) end without opening, and abandoning, a socket.
    const opening = setTimeout(() => provider.connect());
    const analysis = analysisMap(doc);
    provider.messageHandlers[MESSAGE_REFUSED] = (_reply, decoder) => {
      const { message } = readRefusal(decoder);
      setNotice((current) => ({ id: (current?.id ?? 0) + 1, message }));
      setGeneration((current) => current + 1);
    };

    const onStatus = ({ status: next }: { status: "connected" | "disconnected" | "connecting" }) =>
      // A reconnect attempt after a drop is still "offline" to the reader, not a fresh start.
      setStatus((current) =>
        next === "connected" ? "online" : next === "disconnected" || current === "offline" ? "offline" : "connecting",
      );
    const onClosed = () => setStatus("offline");
    const onSync = (state: boolean) => setSynced(state);

    provider.on("status", onStatus);
    provider.on("closed", onClosed);
    provider.on("sync", onSync);
    const stopWatching = watchRoomAnalysis(analysis, setAnalysis);
    setConnection({ doc, provider });

    return () => {
      clearTimeout(opening);
      stopWatching();
      provider.destroy();
      doc.destroy();
      setConnection(null);
      setStatus("connecting");
      setSynced(false);
      setPeers([]);
    };
  }, [mechanismId, generation]);

  const awareness = connection?.provider.awareness ?? null;

  useEffect(() => {
    if (!awareness) return;
    let colour = user.colour ?? pickColour(user.name);
    const publish = () => {
      const published = { name: user.name, colour, role: publishedRole };
      setSelf(published);
      awareness.setLocalStateField(presenceFields.user, published);
    };

    const onChange = () => {
      const others = peersOf(awareness);
      // Awareness changes with every remote caret move; the page re-renders only when people do.
      setPeers((current) => (samePeople(current, others) ? current : others));
      if (user.colour) return;
      // Clients that joined earlier keep their colour; a newcomer with the same one moves on.
      // The same person in a second tab is not a clash.
      const earlier = others.filter((peer) => peer.clientId < awareness.clientID && peer.name !== user.name).map((peer) => peer.colour);
      // When every colour is taken the pick repeats one; comparing first ends the exchange there.
      const next = earlier.includes(colour) ? pickColour(user.name, earlier) : colour;
      if (next !== colour) {
        colour = next;
        publish();
      }
    };

    publish();
    awareness.on("change", onChange);
    onChange();
    return () => awareness.off("change", onChange);
  }, [awareness, user.name, user.colour, publishedRole]);

  return { doc: connection?.doc ?? null, provider: connection?.provider ?? null, awareness, status, synced, analysis, self, peers, notice };
}

function samePeople(a: readonly Peer[], b: readonly Peer[]): boolean {
  return (
    a.length === b.length &&
    a.every((peer, index) => {
      const other = b[index];
      return peer.clientId === other.clientId && peer.name === other.name && peer.colour === other.colour && peer.role === other.role;
    })
  );
}

function peersOf(awareness: Awareness): Peer[] {
  const peers: Peer[] = [];
  awareness.getStates().forEach((state, clientId) => {
    const { user } = readPresence(state);
    if (clientId === awareness.clientID || !user) return;
    peers.push({ clientId, name: user.name, colour: user.colour ?? peerPalette[0], role: user.role ?? "viewer" });
  });
  return peers.sort((a, b) => a.clientId - b.clientId);
}

/**
 * The room's equations while `wanted` (the panel that shows them is open), read whenever they
 * change; null before the first read. They travel apart from the report, so a page that does not
 * show them never unpacks them.
 */
export function useRoomEquations(doc: Y.Doc | null, wanted: boolean): RoomEquations | null {
  const [equations, setEquations] = useState<RoomEquations | null>(null);
  useEffect(() => {
    if (!doc || !wanted) return;
    const stop = watchRoomEquations(analysisMap(doc), setEquations);
    return () => {
      stop();
      setEquations(null);
    };
  }, [doc, wanted]);
  return equations;
}
