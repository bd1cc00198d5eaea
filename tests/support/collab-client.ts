// Real y-websocket clients (the same provider the browser uses) against a test server, signed in
// by cookie; plus a raw socket for messages no honest client would send.
import pg from "pg";
import WebSocket from "ws";
import { WebsocketProvider } from "y-websocket";
import * as Y from "yjs";

export interface RoomClient {
  doc: Y.Doc;
  provider: WebsocketProvider;
  text: Y.Text;
  analysis: Y.Map<unknown>;
  /** Resolves once the server's state has arrived. */
  synced: Promise<void>;
  close(): void;
}

export function collabUrl(baseUrl: string): string {
  return `${baseUrl.replace(/^http/, "ws")}/collab`;
}

/** `ws` with the Cookie header the browser would send. */
function socketWithCookie(cookie: string) {
  return class extends WebSocket {
    constructor(url: string | URL, protocols?: string | string[]) {
      super(url, protocols, { headers: cookie ? { Cookie: cookie } : {} });
    }
  };
}

export function joinRoom(baseUrl: string, mechanismId: string, cookie: string): RoomClient {
  const doc = new Y.Doc();
  const provider = new WebsocketProvider(collabUrl(baseUrl), mechanismId, doc, {
    WebSocketPolyfill: socketWithCookie(cookie) as unknown as typeof globalThis.WebSocket,
    disableBc: true,
    maxBackoffTime: 300,
  });
  const synced = new Promise<void>((resolve) => {
    if (provider.synced) resolve();
    provider.once("sync", (state: boolean) => state && resolve());
  });
  return {
    doc,
    provider,
    text: doc.getText("source"),
    analysis: doc.getMap("analysis"),
    synced,
    close() {
      provider.destroy();
      doc.destroy();
    },
  };
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
