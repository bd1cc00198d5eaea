// One member's socket in a room. Every message is classified first and checked against the
// connection's current role: viewers may sync *from* the server and share presence, never edit.
import type { WebSocket } from "ws";
import { atLeast, type Role } from "../../app/shared/roles";
import { encodeRefusal, type RefusalReason } from "../../app/shared/room-refusal";
import { readClientMessage } from "./protocol";
import type { Credential } from "./credentials";
import { PresenceBudget } from "./presence";

export interface CollabIdentity {
  /** null for a signed-out visitor holding a view link. */
  userId: string | null;
  name: string;
  role: Role;
  /**
   * Re-reads this caller's access, the way it was first decided (a view link can be revoked).
   * Without it the role is re-read from the memberships by userId.
   */
  recheck?: () => Promise<Role | null>;
  /** The session or API token that opened the socket; the socket closes when it ends. */
  credential?: Credential;
}

/** Close codes: 4400–4499 tell the y-websocket client not to reconnect; 4500–4599 to retry later. */
export const closeCodes = {
  /** The role changed: reconnect to sync again under the new role. */
  roleChanged: 4001,
  /** The server is going down or the room is unloading; reconnecting later is fine. */
  goingAway: 1001,
  protocolError: 1002,
  /** The session or token that opened the socket ended (signed out, revoked, expired). */
  signedOut: 4401,
  accessRevoked: 4403,
  mechanismGone: 4404,
  tooSlow: 4508,
} as const;

/** What a connection asks of its room: all it may do there goes through these. */
export interface RoomPort {
  readonly mechanismId: string;
  /** The sync step 2 message answering a member's state vector. */
  syncReply(stateVector: Uint8Array): Uint8Array;
  /** Applies an editor's update, or says why not: unreadable (the connection is dropped) or refused. */
  applyClientUpdate(member: Connection, update: Uint8Array): "applied" | "unreadable" | RefusalReason;
  /** Applies the presence this member may speak for (the rest is skipped). */
  applyClientAwareness(member: Connection, update: Uint8Array): void;
  /** Sends the member everyone's presence. */
  sendAwarenessTo(member: Connection): void;
}

/** A client that cannot keep up is dropped rather than buffered without limit. */
const MAX_BUFFERED_BYTES = 32 * 1024 * 1024;

export class Connection {
  role: Role;
  alive = true;
  readonly presenceBudget = new PresenceBudget();
  private droppedUpdates = 0;
  private droppedPresence = 0;
  /** Refused updates: logged once, then counted, like dropped ones. */
  private refused = 0;

  constructor(
    readonly socket: WebSocket,
    readonly identity: CollabIdentity,
    private readonly room: RoomPort,
  ) {
    this.role = identity.role;
  }

  get canEdit(): boolean {
    return atLeast(this.role, "editor");
  }

  send(data: Uint8Array) {
    if (this.socket.readyState !== this.socket.OPEN) return;
    if (this.socket.bufferedAmount > MAX_BUFFERED_BYTES) {
      console.warn(`[collab] ${this.describe()} is too slow; disconnecting`);
      this.close(closeCodes.tooSlow, "too slow");
      return;
    }
    this.socket.send(data);
  }

  close(code: number, reason: string) {
    if (this.socket.readyState === this.socket.OPEN || this.socket.readyState === this.socket.CONNECTING) this.socket.close(code, reason);
  }

  receive(data: Uint8Array) {
    // A socket being closed (role revoked, room unloading) is heard no more.
    if (this.socket.readyState !== this.socket.OPEN) return;
    const message = readClientMessage(data);
    switch (message.kind) {
      case "sync-step-1":
        this.send(this.room.syncReply(message.stateVector));
        return;
      case "document-update":
        if (!this.canEdit) {
          this.dropUpdate(message.syncType);
          return;
        }
        {
          const outcome = this.room.applyClientUpdate(this, message.update);
          if (outcome === "unreadable") return this.close(closeCodes.protocolError, "bad update");
          // The editor is told why and resyncs; the connection stays open.
          if (outcome !== "applied") {
            this.refused++;
            if (this.refused === 1 || this.refused % 100 === 0) console.warn(`[collab] refused update #${this.refused} (${outcome}) from ${this.describe()}`);
            this.send(encodeRefusal(outcome));
          }
        }
        return;
      case "awareness":
        this.room.applyClientAwareness(this, message.update);
        return;
      case "query-awareness":
        this.room.sendAwarenessTo(this);
        return;
      case "malformed":
        console.warn(`[collab] ${this.describe()} sent a malformed message (${message.reason}); disconnecting`);
        this.close(closeCodes.protocolError, "malformed message");
    }
  }

  /** Logged once, then counted: a viewer's client may carry local edits it keeps offering. */
  private dropUpdate(syncType: string) {
    this.droppedUpdates++;
    if (this.droppedUpdates === 1 || this.droppedUpdates % 100 === 0) {
      console.warn(`[collab] dropped document update (${syncType}) #${this.droppedUpdates} from ${this.describe()}: role ${this.role} may not edit`);
    }
  }

  /** Presence over the budget: logged once, then counted. */
  presenceDropped() {
    this.droppedPresence++;
    if (this.droppedPresence === 1 || this.droppedPresence % 100 === 0) {
      console.warn(`[collab] dropped presence #${this.droppedPresence} from ${this.describe()}: over its rate`);
    }
  }

  describe(): string {
    return `${this.identity.name} (${this.identity.userId ?? "view link"}) in ${this.room.mechanismId}`;
  }
}
