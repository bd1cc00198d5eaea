// All live rooms of the process, in one place: loading on first use, unloading when idle, and
// the operations routes call (role changes, API writes, versions). Each room is linked to the
// other instances holding it through the bus (room-link.ts).
import type { WebSocket } from "ws";
import type { FitNotice } from "../../app/shared/room-document";
import type { Analyzer } from "./analysis-entries";
import { closeCodes, Connection, type CollabIdentity } from "./connection";
import { RoleChangeFeed, type RoleChange } from "./role-feed";
import { Room, type RoomTimings } from "./room";
import { soloBus, type AccessChange, type RoomBus } from "./room-bus";
import { RoomLink } from "./room-link";
import type { CollabStore } from "./store";

export interface HubTimings extends RoomTimings {
  /** A room without connections is unloaded (after flushing) when this long idle. */
  idleUnloadMs: number;
  /** How often the audit trail of role changes is read (see role-feed.ts). */
  roleFeedMs: number;
  /** Safety net: every connection's role re-read from the memberships. */
  roleSweepMs: number;
  /** Sockets that miss a ping for this long are dropped. */
  heartbeatMs: number;
  /** An analysis of a room's text running longer is stopped; the room shows why. */
  analysisTimeoutMs: number;
  /** How often a follower tries to lead a room, should its leader die without a word. */
  leaderRetryMs: number;
}

export const defaultTimings: HubTimings = {
  recomputeMs: 60,
  snapshotQuietMs: 3000,
  sourceMirrorMs: 1000,
  compactEvery: 500,
  idleUnloadMs: 30_000,
  roleFeedMs: 1000,
  roleSweepMs: 30_000,
  heartbeatMs: 30_000,
  analysisTimeoutMs: 20_000,
  leaderRetryMs: 1000,
};

export class CollabHub {
  private readonly rooms = new Map<string, Promise<Room | null>>();
  private readonly links = new Map<string, RoomLink>();
  private readonly unloading = new Map<string, Promise<void>>();
  private readonly idleTimers = new Map<string, NodeJS.Timeout>();
  private readonly intervals: NodeJS.Timeout[];
  private readonly timings: HubTimings;
  private readonly roleFeed: RoleChangeFeed;
  private readonly connections = new Set<Connection>();
  private checkingCredentials = false;
  private credentialsAgain = false;

  /** The hub owns `analysis` and `bus` from here on: closing the hub stops them. */
  constructor(
    private readonly store: CollabStore,
    private readonly analysis: Analyzer,
    timings: Partial<HubTimings> = {},
    private readonly bus: RoomBus = soloBus(),
  ) {
    this.timings = { ...defaultTimings, ...timings };
    this.intervals = [
      setInterval(() => void this.sweepRoles(), this.timings.roleSweepMs),
      setInterval(() => this.heartbeat(), this.timings.heartbeatMs),
      // Sessions and tokens end outside the audit trail, so they are followed at its pace.
      setInterval(() => void this.checkCredentials(), this.timings.roleFeedMs),
    ];
    for (const interval of this.intervals) interval.unref();
    this.roleFeed = new RoleChangeFeed(store, (change) => this.applyRoleChange(change));
    this.roleFeed.start(this.timings.roleFeedMs);
    // Any instance's change reaches this one's sockets at once; the timers above are the safety net.
    bus.onAccessChange((change: AccessChange) => void (change === "roles" ? this.roleFeed.readNow() : this.checkCredentials()));
  }

  /**
   * Re-reads a user's role on a mechanism and applies it to their open connections at once:
   * revoked → closed for good (4403); changed → closed to reconnect under the new role (4001).
   */
  async refreshRole(mechanismId: string, userId: string): Promise<void> {
    await this.recheck(mechanismId, (connection) => connection.identity.userId === userId);
  }

  /** The whole text, written as one edit by `userId` into the live document. False if no such mechanism. */
  async replaceSource(mechanismId: string, source: string, userId: string): Promise<boolean> {
    return (await this.withRoom(mechanismId, (room) => room.replaceSource(source, userId))) !== null;
  }

  /**
   * Writes fitted values into the text as one edit by `userId` and names the version that results.
   * Null if no such mechanism; `undeclared` names values the text does not declare (nothing written).
   */
  async applyValues(mechanismId: string, userId: string, values: Record<string, number>, versionName: string) {
    return this.withRoom(mechanismId, async (room) => {
      const { undeclared, previous } = await room.writeValues(values, userId);
      if (undeclared.length > 0) return { undeclared, previous, snapshot: null };
      return { undeclared, previous, snapshot: await room.recordSnapshot("named", versionName, userId) };
    });
  }

  /** Announces a fit's start or end to the room's members (room-document.ts `fits`). */
  async announceFit(mechanismId: string, fitId: string, notice: FitNotice) {
    await this.withRoom(mechanismId, (room) => room.announceFit(fitId, notice));
  }

  async createNamedSnapshot(mechanismId: string, authorId: string, name: string) {
    return this.withRoom(mechanismId, (room) => room.recordSnapshot("named", name, authorId));
  }

  /**
   * Puts an old version's text into the live document as a new edit (history is kept) and marks
   * it with a `restore` snapshot. Null when the mechanism or the version does not exist.
   */
  async restoreSnapshot(mechanismId: string, userId: string, snapshotId: number) {
    const snapshot = await this.store.findSnapshotSource(mechanismId, snapshotId);
    if (!snapshot) return null;
    return this.withRoom(mechanismId, async (room) => {
      await room.replaceSource(snapshot.source, userId);
      return room.recordSnapshot("restore", `Restored #${snapshot.id}`, userId);
    });
  }

  /** After a mechanism is deleted: closes its room without writing anything more. */
  async forgetMechanism(mechanismId: string) {
    const room = await this.rooms.get(mechanismId);
    this.rooms.delete(mechanismId);
    this.clearIdle(mechanismId);
    room?.abandon();
    await this.unlink(mechanismId);
  }

  /** Admits an authenticated socket; `accept` completes the WebSocket handshake. False if no such mechanism. */
  async admit(mechanismId: string, identity: CollabIdentity, accept: (join: (socket: WebSocket) => void) => Promise<void>): Promise<boolean> {
    const admitted = await this.withRoom(mechanismId, (room) =>
      accept((socket) => {
        const connection = new Connection(socket, identity, room);
        socket.binaryType = "nodebuffer";
        socket.on("message", (data: Buffer) => connection.receive(new Uint8Array(data.buffer, data.byteOffset, data.byteLength)));
        socket.on("pong", () => (connection.alive = true));
        socket.on("error", (error) => console.warn(`[collab] socket error for ${connection.describe()}: ${error.message}`));
        this.connections.add(connection);
        socket.on("close", () => {
          this.connections.delete(connection);
          room.leave(connection);
          this.scheduleUnloadIfIdle(room);
        });
        room.join(connection);
      }),
    );
    return admitted !== null;
  }

  /** Unloads every room (flushing each); for shutdown. */
  async close() {
    this.roleFeed.stop();
    for (const interval of this.intervals) clearInterval(interval);
    for (const id of this.idleTimers.keys()) this.clearIdle(id);
    const ids = [...this.rooms.keys()];
    await Promise.all(ids.map((id) => this.unload(id)));
    await Promise.all(this.unloading.values());
    this.analysis.stop();
    await this.bus.close();
  }

  private async room(mechanismId: string): Promise<Room | null> {
    await this.unloading.get(mechanismId);
    let loading = this.rooms.get(mechanismId);
    if (!loading) {
      loading = this.load(mechanismId);
      this.rooms.set(mechanismId, loading);
      loading.then(
        (room) => (room ? this.scheduleUnloadIfIdle(room) : this.rooms.delete(mechanismId)),
        () => this.rooms.delete(mechanismId),
      );
    }
    return loading;
  }

  /** Joins the other instances holding the room before loading it, then tries to lead it. */
  private async load(mechanismId: string): Promise<Room | null> {
    const link = new RoomLink(this.bus, this.store, mechanismId, this.timings.leaderRetryMs);
    try {
      const room = await Room.load(this.store, this.analysis, mechanismId, this.timings, {
        publishPresence: (updates) => this.bus.publishPresence(mechanismId, updates),
      });
      if (!room) {
        await link.close();
        return null;
      }
      this.links.set(mechanismId, link);
      await link.attach(room);
      return room;
    } catch (error) {
      await link.close();
      throw error;
    }
  }

  /** After the room has closed: its leadership (if any) goes to another instance. */
  private async unlink(mechanismId: string) {
    const link = this.links.get(mechanismId);
    this.links.delete(mechanismId);
    await link?.close();
  }

  private async withRoom<T>(mechanismId: string, task: (room: Room) => Promise<T>): Promise<T | null> {
    const room = await this.room(mechanismId);
    if (!room) return null;
    room.leases++;
    this.clearIdle(mechanismId);
    try {
      return await task(room);
    } finally {
      room.leases--;
      this.scheduleUnloadIfIdle(room);
    }
  }

  private scheduleUnloadIfIdle(room: Room) {
    if (!room.idle || this.idleTimers.has(room.mechanismId)) return;
    const timer = setTimeout(() => {
      this.idleTimers.delete(room.mechanismId);
      if (room.idle) void this.unload(room.mechanismId);
    }, this.timings.idleUnloadMs);
    this.idleTimers.set(room.mechanismId, timer);
  }

  private clearIdle(mechanismId: string) {
    clearTimeout(this.idleTimers.get(mechanismId));
    this.idleTimers.delete(mechanismId);
  }

  private async unload(mechanismId: string) {
    const loading = this.rooms.get(mechanismId);
    if (!loading) return;
    this.rooms.delete(mechanismId);
    this.clearIdle(mechanismId);
    const closing = loading
      .then((room) => room?.close())
      .catch((error: Error) => console.error(`[collab] unloading ${mechanismId} failed: ${error.stack}`))
      .then(() => this.unlink(mechanismId))
      .finally(() => this.unloading.delete(mechanismId));
    this.unloading.set(mechanismId, closing);
    await closing;
  }

  private async applyRoleChange({ mechanismId, userId, action }: RoleChange) {
    if (!this.rooms.has(mechanismId)) return;
    if (action === "delete") return this.forgetMechanism(mechanismId);
    // Invitations and new view links change the access of nobody in the room.
    if (action === "invite" || action === "uninvite" || action === "link") return;
    // A transfer also lowers the old owner, whom the audit row does not name.
    if (userId && action !== "transfer") return this.refreshRole(mechanismId, userId);
    await this.refreshRoom(mechanismId);
  }

  private refreshRoom(mechanismId: string) {
    return this.recheck(mechanismId, () => true);
  }

  private async recheck(mechanismId: string, which: (connection: Connection) => boolean) {
    const room = await this.rooms.get(mechanismId)?.catch(() => null);
    if (!room) return;
    for (const connection of [...room.connections].filter(which)) {
      const { identity } = connection;
      let role;
      try {
        role = identity.recheck ? await identity.recheck() : identity.userId ? await this.store.roleOf(mechanismId, identity.userId) : connection.role;
      } catch (error) {
        console.error(`[collab] re-checking ${connection.describe()} failed: ${(error as Error).message}`);
        continue;
      }
      if (role === connection.role) continue;
      console.log(`[collab] ${connection.describe()}: role ${connection.role} → ${role ?? "none"}`);
      // The new role applies before the close completes, so nothing more is accepted meanwhile.
      connection.role = role ?? "viewer";
      connection.close(role ? closeCodes.roleChanged : closeCodes.accessRevoked, role ? "role changed" : "access revoked");
    }
  }

  private async checkCredentials() {
    if (this.checkingCredentials) {
      // A credential may have ended after the running check read it.
      this.credentialsAgain = true;
      return;
    }
    if (this.connections.size === 0) return;
    this.checkingCredentials = true;
    this.credentialsAgain = false;
    try {
      for (const connection of await this.store.endedCredentials(this.connections)) {
        console.log(`[collab] ${connection.describe()}: credential ended; closing`);
        // Nothing more is accepted from it while the close completes.
        connection.role = "viewer";
        connection.close(closeCodes.signedOut, "signed out");
      }
    } catch (error) {
      console.error(`[collab] checking credentials failed: ${(error as Error).message}`);
    } finally {
      this.checkingCredentials = false;
      if (this.credentialsAgain) void this.checkCredentials();
    }
  }

  private async sweepRoles() {
    for (const mechanismId of [...this.rooms.keys()]) await this.refreshRoom(mechanismId);
  }

  private heartbeat() {
    for (const loading of this.rooms.values()) {
      void loading.then((room) => {
        for (const connection of room?.connections ?? []) {
          if (!connection.alive) {
            connection.socket.terminate();
            continue;
          }
          connection.alive = false;
          connection.socket.ping();
        }
      });
    }
  }
}
