// Real y-websocket clients (the same provider the browser uses) against a test server, signed in
// by cookie; a bare protocol client that only follows the room; and a raw socket for messages no
// honest client would send.
import * as decoding from "lib0/decoding";
import * as encoding from "lib0/encoding";
import pg from "pg";
import WebSocket from "ws";
import * as awarenessProtocol from "y-protocols/awareness";
import * as syncProtocol from "y-protocols/sync";
import { WebsocketProvider } from "y-websocket";
import * as Y from "yjs";
import { analysisMap, sourceText } from "../../app/shared/room-document";
import { MESSAGE_REFUSED, readRefusal, type RefusalReason } from "../../app/shared/room-refusal";

/** A member's live copy of the room. */
export interface RoomReplica {
  doc: Y.Doc;
  text: Y.Text;
  analysis: Y.Map<unknown>;
  /** Resolves once the server's state has arrived. */
  synced: Promise<void>;
  close(): void;
}

export interface RoomClient extends RoomReplica {
  provider: WebsocketProvider;
  /** Reasons the server gave for refusing this client's edits, in order. */
  refusals: RefusalReason[];
}

export function collabUrl(baseUrl: string): string {
  return `${baseUrl.replace(/^http/, "ws")}/collab`;
}

/**
 * `ws` with the Cookie header the browser would send (or a script's Authorization header);
 * `onMessage` sees each incoming message before the provider handles it.
 */
function socketWithCookie(cookie: string, onMessage?: (data: Buffer) => void, authorization?: string) {
  return class extends WebSocket {
    constructor(url: string | URL, protocols?: string | string[]) {
      super(url, protocols, { headers: { ...(cookie ? { Cookie: cookie } : {}), ...(authorization ? { Authorization: authorization } : {}) } });
      if (onMessage) this.on("message", (data: Buffer | ArrayBuffer) => onMessage(Buffer.isBuffer(data) ? data : Buffer.from(data)));
    }
  };
}

export function joinRoom(
  baseUrl: string,
  mechanismId: string,
  cookie: string,
  options: { onMessage?: (data: Buffer) => void; authorization?: string } = {},
): RoomClient {
  const doc = new Y.Doc();
  const provider = new WebsocketProvider(collabUrl(baseUrl), mechanismId, doc, {
    WebSocketPolyfill: socketWithCookie(cookie, options.onMessage, options.authorization) as unknown as typeof globalThis.WebSocket,
    disableBc: true,
    maxBackoffTime: 300,
  });
  const refusals: RefusalReason[] = [];
  provider.messageHandlers[MESSAGE_REFUSED] = (_reply, decoder) => refusals.push(readRefusal(decoder).reason);
  const synced = new Promise<void>((resolve) => {
    if (provider.synced) resolve();
    provider.once("sync", (state: boolean) => state && resolve());
  });
  return {
    doc,
    provider,
    refusals,
    text: sourceText(doc),
    analysis: analysisMap(doc),
    synced,
    close() {
      provider.destroy();
      doc.destroy();
    },
  };
}

const MESSAGE_SYNC = 0;
const MESSAGE_AWARENESS = 1;

/**
 * A member who only follows the room: the Yjs sync and awareness protocols over one socket,
 * applied to a Y.Doc, without the provider's reconnecting and change broadcasting. A benchmark
 * hosting a hundred viewers on the server's own cores uses these, so that work which real
 * viewers do on their own machines weighs as little as the protocol allows.
 */
export function followRoom(baseUrl: string, mechanismId: string, cookie: string, options: { onMessage?: (data: Buffer) => void } = {}): RoomReplica {
  const doc = new Y.Doc();
  const awareness = new awarenessProtocol.Awareness(doc);
  const socket = new WebSocket(`${collabUrl(baseUrl)}/${mechanismId}`, { headers: cookie ? { Cookie: cookie } : {} });
  socket.binaryType = "nodebuffer";
  const send = (write: (encoder: encoding.Encoder) => void) => {
    const encoder = encoding.createEncoder();
    write(encoder);
    if (socket.readyState === socket.OPEN) socket.send(encoding.toUint8Array(encoder));
  };
  let markSynced = () => {};
  const synced = new Promise<void>((resolve) => (markSynced = resolve));
  socket.on("open", () => {
    send((encoder) => {
      encoding.writeVarUint(encoder, MESSAGE_SYNC);
      syncProtocol.writeSyncStep1(encoder, doc);
    });
    send((encoder) => {
      encoding.writeVarUint(encoder, MESSAGE_AWARENESS);
      encoding.writeVarUint8Array(encoder, awarenessProtocol.encodeAwarenessUpdate(awareness, [doc.clientID]));
    });
  });
  socket.on("message", (data: Buffer) => {
    options.onMessage?.(data);
    const decoder = decoding.createDecoder(data);
    const type = decoding.readVarUint(decoder);
    if (type === MESSAGE_AWARENESS) {
      awarenessProtocol.applyAwarenessUpdate(awareness, decoding.readVarUint8Array(decoder), socket);
    } else if (type === MESSAGE_SYNC) {
      const reply = encoding.createEncoder();
      encoding.writeVarUint(reply, MESSAGE_SYNC);
      if (syncProtocol.readSyncMessage(decoder, reply, doc, socket) === syncProtocol.messageYjsSyncStep2) markSynced();
      if (encoding.length(reply) > 1 && socket.readyState === socket.OPEN) socket.send(encoding.toUint8Array(reply));
    }
  });
  return {
    doc,
    text: sourceText(doc),
    analysis: analysisMap(doc),
    synced,
    close() {
      awareness.destroy();
      socket.close();
      doc.destroy();
    },
  };
}

/** Types single characters (and deletes a few) at random places until `running` says stop; resolves with the count. */
export async function typeAtRandom(text: Y.Text, running: () => boolean): Promise<number> {
  let edits = 0;
  for (; running() && edits < 5000; edits++) {
    const at = Math.floor(Math.random() * (text.length + 1));
    if (Math.random() < 0.8 || text.length === 0) text.insert(at, "XY+ \n"[Math.floor(Math.random() * 5)]);
    else text.delete(Math.min(at, text.length - 1), 1);
    await new Promise((resolve) => setTimeout(resolve, Math.floor(Math.random() * 4)));
  }
  return edits;
}

/** Polls until `check` holds; fails with `what` after `timeoutMs`. */
export async function eventually(what: string, check: () => boolean | Promise<boolean>, timeoutMs = 10_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

/** Opens a bare socket; resolves with the HTTP status when the upgrade is refused. */
export function rawSocket(baseUrl: string, mechanismId: string, cookie: string): Promise<{ socket: WebSocket } | { refused: number }> {
  return new Promise((resolve, reject) => {
    const socket = new WebSocket(`${collabUrl(baseUrl)}/${mechanismId}`, { headers: cookie ? { Cookie: cookie } : {} });
    socket.binaryType = "nodebuffer";
    socket.once("open", () => resolve({ socket }));
    socket.once("unexpected-response", (_request, response) => {
      resolve({ refused: response.statusCode ?? 0 });
      socket.terminate();
    });
    socket.once("error", (error) => reject(error));
  });
}

/** The document as the server stored it (compacted state plus logged updates), read straight from PostgreSQL. */
export async function storedDocument(databaseUrl: string, mechanismId: string): Promise<Y.Doc> {
  const client = new pg.Client(databaseUrl);
  await client.connect();
  try {
    const doc = new Y.Doc();
    const state = await client.query("select state from doc_states where mechanism_id = $1", [mechanismId]);
    if (state.rows[0]) Y.applyUpdate(doc, state.rows[0].state);
    const updates = await client.query("select update from doc_updates where mechanism_id = $1 order by id", [mechanismId]);
    for (const row of updates.rows) Y.applyUpdate(doc, row.update);
    return doc;
  } finally {
    await client.end();
  }
}
