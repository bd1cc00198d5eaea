// How the app instances on one database reach each other: one dedicated PostgreSQL connection per
// process that LISTENs for what the others commit, carries presence (NOTIFY, never stored), and
// holds the session advisory locks that make an instance a room's leader. The connection ending
// frees its locks in PostgreSQL, so a leader that dies hands its rooms on by itself.
import pg from "pg";
import { z } from "zod";
import { ROOMS_CHANNEL } from "./persistence";

/** What a room hears from the other instances holding it (room-link.ts answers). */
export interface RoomListener {
  /** Another instance committed rows `first`…`last` of this room's log. */
  committed(first: number, last: number): void;
  /** Presence of another instance's members: awareness updates, each for one client. */
  presence(updates: Uint8Array[]): void;
  /** The leader let go of the room (it unloaded it): someone else may lead now. */
  leaderLeft(): void;
  /** The link is down: this instance leads nothing, and hears nothing until it is back. */
  linkLost(): void;
  /** The link is back: whatever was said meanwhile is unheard, so read the room again. */
  linkRestored(): void;
}

export type AccessChange = "roles" | "credentials";

export interface RoomBus {
  /** This process's name (server/instance.ts). */
  readonly instance: string;
  join(mechanismId: string, listener: RoomListener): void;
  leave(mechanismId: string): void;
  publishPresence(mechanismId: string, updates: Uint8Array[]): void;
  /** True when this instance now leads the room; call only while it does not. */
  tryLead(mechanismId: string): Promise<boolean>;
  /** Lets go of leading the room and tells the others at once. */
  resign(mechanismId: string): Promise<void>;
  /** Role changes and ended credentials, from any instance (the migration's triggers). */
  onAccessChange(listener: (change: AccessChange) => void): void;
  close(): Promise<void>;
}

/** One process alone: nobody to tell, and it leads every room (the fast tests). */
export function soloBus(instance = "solo"): RoomBus {
  return {
    instance,
    join() {},
    leave() {},
    publishPresence() {},
    tryLead: async () => true,
    resign: async () => {},
    onAccessChange() {},
    close: async () => {},
  };
}

export const ACCESS_CHANNEL = "mechweave_access";
/** A notification's payload is limited to 8000 bytes; presence is packed below that. */
const MAX_PAYLOAD_BYTES = 7000;
const RECONNECT_MS = [100, 250, 500, 1000, 2000, 5000];

const roomMessage = z.object({ room: z.string(), from: z.string() }).and(
  z.union([
    z.object({ first: z.number().int(), last: z.number().int() }),
    z.object({ presence: z.array(z.string()).max(64) }),
    z.object({ left: z.literal(true) }),
  ]),
);

/** The room's leadership lock: one 64-bit key from its id (a collision would only share a leader). */
const leaderKey = (mechanismId: string) => `mechweave-lead:${mechanismId}`;

export class PostgresRoomBus implements RoomBus {
  private client: pg.Client | null = null;
  private readonly listeners = new Map<string, RoomListener>();
  private readonly accessListeners: ((change: AccessChange) => void)[] = [];
  private closed = false;
  private reconnects = 0;

  private constructor(
    private readonly databaseUrl: string,
    readonly instance: string,
  ) {}

  static async connect(databaseUrl: string, instance: string): Promise<PostgresRoomBus> {
    const bus = new PostgresRoomBus(databaseUrl, instance);
    await bus.open();
    return bus;
  }

  join(mechanismId: string, listener: RoomListener) {
    this.listeners.set(mechanismId, listener);
  }

  leave(mechanismId: string) {
    this.listeners.delete(mechanismId);
  }

  onAccessChange(listener: (change: AccessChange) => void) {
    this.accessListeners.push(listener);
  }

  /** Packs as many updates as fit into each notification; one too large for any stays local. */
  publishPresence(mechanismId: string, updates: Uint8Array[]) {
    const envelope = Buffer.byteLength(JSON.stringify({ room: mechanismId, from: this.instance, presence: [] }));
    let batch: string[] = [];
    let bytes = envelope;
    const send = () => {
      if (batch.length > 0) this.notify(ROOMS_CHANNEL, { room: mechanismId, from: this.instance, presence: batch });
      batch = [];
      bytes = envelope;
    };
    for (const update of updates) {
      const encoded = Buffer.from(update).toString("base64");
      if (envelope + encoded.length + 3 > MAX_PAYLOAD_BYTES) continue;
      if (bytes + encoded.length + 3 > MAX_PAYLOAD_BYTES || batch.length === 64) send();
      batch.push(encoded);
      bytes += encoded.length + 3;
    }
    send();
  }

  async tryLead(mechanismId: string): Promise<boolean> {
    const client = this.client;
    if (!client) return false;
    const { rows } = await client.query<{ locked: boolean }>("select pg_try_advisory_lock(hashtextextended($1, 0)) as locked", [leaderKey(mechanismId)]);
    // A lock taken on a connection that has since been replaced is already gone.
    return rows[0].locked && client === this.client;
  }

  async resign(mechanismId: string) {
    const client = this.client;
    if (!client) return;
    try {
      await client.query("select pg_advisory_unlock(hashtextextended($1, 0))", [leaderKey(mechanismId)]);
      this.notify(ROOMS_CHANNEL, { room: mechanismId, from: this.instance, left: true });
    } catch (error) {
      // The connection is going or gone, and the lock with it.
      console.warn(`[collab] letting go of ${mechanismId}: ${(error as Error).message}`);
    }
  }

  async close() {
    this.closed = true;
    this.listeners.clear();
    await this.client?.end().catch(() => {});
    this.client = null;
  }

  private async open() {
    const client = new pg.Client({ connectionString: this.databaseUrl, keepAlive: true });
    client.on("notification", (message) => this.heard(message.channel, message.payload ?? ""));
    client.on("error", (error) => {
      console.warn(`[collab] the instances' link to PostgreSQL failed: ${error.message}`);
      this.dropped(client);
    });
    client.on("end", () => this.dropped(client));
    await client.connect();
    await client.query(`listen ${ROOMS_CHANNEL}; listen ${ACCESS_CHANNEL}`);
    this.client = client;
  }

  /** Every room becomes a follower at once (its locks went with the connection), then reconnects. */
  private dropped(client: pg.Client) {
    if (this.client !== client) return;
    this.client = null;
    client.end().catch(() => {});
    if (this.closed) return;
    for (const listener of this.listeners.values()) listener.linkLost();
    void this.reconnect();
  }

  private async reconnect() {
    while (!this.closed && !this.client) {
      await new Promise((resolve) => setTimeout(resolve, RECONNECT_MS[Math.min(this.reconnects++, RECONNECT_MS.length - 1)]));
      try {
        await this.open();
      } catch (error) {
        if (this.reconnects % 10 === 1) console.warn(`[collab] reconnecting the instances' link: ${(error as Error).message}`);
      }
    }
    if (this.closed) return void this.client?.end().catch(() => {});
    this.reconnects = 0;
    for (const listener of this.listeners.values()) listener.linkRestored();
    // Access may have changed while nobody listened.
    for (const listener of this.accessListeners) {
      listener("roles");
      listener("credentials");
    }
  }

  private notify(channel: string, message: object) {
    this.client?.query("select pg_notify($1, $2)", [channel, JSON.stringify(message)]).catch((error: Error) => {
      console.warn(`[collab] notifying the other instances failed: ${error.message}`);
    });
  }

  private heard(channel: string, payload: string) {
    if (channel === ACCESS_CHANNEL) {
      if (payload === "roles" || payload === "credentials") for (const listener of this.accessListeners) listener(payload);
      return;
    }
    let parsed;
    try {
      parsed = roomMessage.safeParse(JSON.parse(payload));
    } catch {
      parsed = null;
    }
    if (!parsed?.success) return console.warn(`[collab] unreadable notification on ${channel}: ${payload.slice(0, 200)}`);
    const message = parsed.data;
    if (message.from === this.instance) return;
    const listener = this.listeners.get(message.room);
    if (!listener) return;
    if ("first" in message) listener.committed(message.first, message.last);
    else if ("presence" in message) listener.presence(message.presence.map((encoded) => new Uint8Array(Buffer.from(encoded, "base64"))));
    else listener.leaderLeft();
  }
}
