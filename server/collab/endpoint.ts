// The collaboration WebSocket on the app's own http.Server: `/collab/:id` only, authenticated
// before the handshake, so a refused caller never gets a socket.
import type { IncomingMessage, Server } from "node:http";
import type { Duplex } from "node:stream";
import { WebSocketServer } from "ws";
import { mechanismIdField } from "../../app/shared/fields";
import type { Db } from "../db/client";
import { isDatabaseUnavailable } from "../db/unavailable";
import { isOwnOrigin } from "../origin";
import type { WorkerBudget } from "../worker-budget";
import type { CollabIdentity } from "./connection";
import { AnalysisPool } from "./analysis-pool";
import { CollabHub, defaultTimings, type HubTimings } from "./hub";
import { postgresCollabStore } from "./postgres-store";
import { PostgresRoomBus } from "./room-bus";

export type Identify = (request: IncomingMessage, mechanismId: string) => Promise<CollabIdentity | null>;

/** Thrown by an `identify` hook to refuse with a specific status (e.g. 401 when signed out). */
export class UpgradeRefusal extends Error {
  constructor(
    readonly status: 401 | 403 | 404,
    message: string,
  ) {
    super(message);
  }
}

export interface CollaborationOptions {
  db: Db;
  /** The database again, for the instance's own connection to the others (room-bus.ts). */
  databaseUrl: string;
  /** This process's name among the instances (server/instance.ts). */
  instance: string;
  /** Who is asking for this mechanism, with which role; null refuses with 404. */
  identify: Identify;
  timings?: Partial<HubTimings>;
  /** The process's worker budget; the rooms' analysis threads are sized from it. */
  workers: WorkerBudget;
  /** PUBLIC_URL's origin: browsers on it may connect besides those on the request's own host. */
  publicOrigin: string | null;
  /** Upgrades another listener answers (Vite's hot reload in development); every other path is refused. */
  leave?: (request: IncomingMessage) => boolean;
}

/** A document update may hold the whole text (≤ 1 MiB) with its history. */
const MAX_MESSAGE_BYTES = 8 * 1024 * 1024;
const roomPath = /^\/collab\/([^/]+)$/;

const statusText: Record<number, string> = { 400: "Bad Request", 401: "Unauthorized", 403: "Forbidden", 404: "Not Found", 500: "Internal Server Error", 503: "Service Unavailable" };

/** Answers and closes: ending only half-closes, and a client that never hangs up would keep the descriptor. */
function refuse(socket: Duplex, status: number, message: string) {
  if (!socket.writable) return socket.destroy();
  const body = JSON.stringify({ error: message });
  socket.once("finish", () => socket.destroy());
  socket.end(
    `HTTP/1.1 ${status} ${statusText[status]}\r\nConnection: close\r\nContent-Type: application/json\r\nContent-Length: ${Buffer.byteLength(body)}\r\n\r\n${body}`,
  );
}

export async function attachCollaboration(server: Server, options: CollaborationOptions): Promise<CollabHub> {
  const analysisTimeoutMs = options.timings?.analysisTimeoutMs ?? defaultTimings.analysisTimeoutMs;
  const hub = new CollabHub(
    postgresCollabStore(options.db, options.instance),
    new AnalysisPool(analysisTimeoutMs, options.workers.analysisThreads),
    options.timings,
    await PostgresRoomBus.connect(options.databaseUrl, options.instance),
  );

  /** A browser always sends Origin; it must be this site (blocks cross-site socket hijacking). */
  function sameOrigin(request: IncomingMessage): boolean {
    const origin = request.headers.origin;
    return !origin || isOwnOrigin(origin, request.headers.host, options.publicOrigin);
  }

  const sockets = new WebSocketServer({ noServer: true, maxPayload: MAX_MESSAGE_BYTES, perMessageDeflate: false });

  async function upgrade(request: IncomingMessage, socket: Duplex, head: Buffer, rawId: string) {
    if (!sameOrigin(request)) throw new UpgradeRefusal(403, "Cross-site connections are not accepted.");
    // Ids are plain letters, digits, _ and -: an escaped one is no id (and may not even decode).
    const mechanismId = mechanismIdField.safeParse(rawId);
    if (!mechanismId.success) throw new UpgradeRefusal(404, "No mechanism with that id is visible to you.");
    const identity = await options.identify(request, mechanismId.data);
    if (!identity) throw new UpgradeRefusal(404, "No mechanism with that id is visible to you.");
    const admitted = await hub.admit(
      mechanismId.data,
      identity,
      (join) =>
        new Promise<void>((resolve) => {
          socket.once("close", () => resolve());
          sockets.handleUpgrade(request, socket, head, (ws) => {
            join(ws);
            resolve();
          });
        }),
    );
    if (!admitted) throw new UpgradeRefusal(404, "No mechanism with that id is visible to you.");
  }

  server.on("upgrade", (request: IncomingMessage, socket: Duplex, head: Buffer) => {
    if (options.leave?.(request)) return;
    socket.on("error", () => socket.destroy());
    const target = URL.parse(request.url ?? "/", "http://localhost");
    if (!target) return refuse(socket, 400, "That request target is not a URL.");
    const match = roomPath.exec(target.pathname);
    // Nobody else listens for upgrades: a socket left unanswered would hang and leak.
    if (!match) return refuse(socket, 404, "WebSockets are served at /collab/:id only.");
    upgrade(request, socket, head, match[1]).catch((error: unknown) => {
      if (error instanceof UpgradeRefusal) return refuse(socket, error.status, error.message);
      if (isDatabaseUnavailable(error)) return refuse(socket, 503, "The database is unavailable just now; try again shortly.");
      console.error(`[collab] upgrade failed: ${(error as Error).stack}`);
      refuse(socket, 500, "The collaboration server failed; try again.");
    });
  });
  return hub;
}
