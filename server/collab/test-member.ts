// A room member for the fast tests: a socket that records what the server sends and reports a
// close as `ws` does (a moment later), and a client copy of the document kept in step from those
// messages by the Yjs protocols. Nothing crosses a network; everything else is real.
import { EventEmitter } from "node:events";
import * as decoding from "lib0/decoding";
import * as encoding from "lib0/encoding";
import type { WebSocket } from "ws";
import * as awarenessProtocol from "y-protocols/awareness";
import * as syncProtocol from "y-protocols/sync";
import * as Y from "yjs";
import { sourceText } from "../../app/shared/room-document";
import { MESSAGE_REFUSED, readRefusal, type RefusalReason } from "../../app/shared/room-refusal";
import type { CollabIdentity } from "./connection";
import type { CollabHub } from "./hub";
import { awarenessMessage, updateMessage } from "./protocol";

export class FakeSocket extends EventEmitter {
  readonly CONNECTING = 0;
  readonly OPEN = 1;
  readonly CLOSING = 2;
  readonly CLOSED = 3;
  readyState = 1;
  bufferedAmount = 0;
  binaryType = "nodebuffer";
  readonly sent: Uint8Array[] = [];
  closedWith: { code: number; reason: string } | null = null;

  send(data: Uint8Array) {
    this.sent.push(data);
    this.emit("sent", data);
  }

  close(code: number, reason: string) {
    if (this.readyState >= this.CLOSING) return;
    this.readyState = this.CLOSING;
    this.closedWith = { code, reason };
    setImmediate(() => {
      this.readyState = this.CLOSED;
      this.emit("close", code, reason);
    });
  }

  ping() {}

  terminate() {
    this.close(1006, "terminated");
  }

  /** A message from the client, as `ws` delivers it. */
  deliver(data: Uint8Array) {
    this.emit("message", Buffer.from(data));
  }
}

export class TestMember {
  readonly socket = new FakeSocket();
  readonly doc = new Y.Doc();
  readonly awareness = new awarenessProtocol.Awareness(this.doc);
  readonly refusals: RefusalReason[] = [];
  /** Document updates relayed to this member, as sent. */
  readonly relayed: Uint8Array[] = [];

  constructor(readonly identity: CollabIdentity) {
    this.awareness.setLocalState(null);
    this.socket.on("sent", (data: Uint8Array) => this.hear(data));
  }

  get text(): string {
    return sourceText(this.doc).toString();
  }

  /** Asks the server for its whole document (sync step 1). */
  sync() {
    const encoder = encoding.createEncoder();
    encoding.writeVarUint(encoder, 0);
    syncProtocol.writeSyncStep1(encoder, this.doc);
    this.socket.deliver(encoding.toUint8Array(encoder));
  }

  /** Makes a change on the client copy and sends it as an incremental update. */
  edit(change: (doc: Y.Doc) => void) {
    const updates: Uint8Array[] = [];
    const collect = (update: Uint8Array) => updates.push(update);
    this.doc.on("update", collect);
    this.doc.transact(() => change(this.doc), this);
    this.doc.off("update", collect);
    for (const update of updates) this.socket.deliver(updateMessage(update));
  }

  /** Publishes a presence state for `clientId` (this member's own client by default). */
  publish(state: Record<string, unknown>, clientId = this.doc.clientID, clock = 1) {
    const encoder = encoding.createEncoder();
    encoding.writeVarUint(encoder, 1);
    encoding.writeVarUint(encoder, clientId);
    encoding.writeVarUint(encoder, clock);
    encoding.writeVarString(encoder, JSON.stringify(state));
    this.socket.deliver(awarenessMessage(encoding.toUint8Array(encoder)));
  }

  /** The presence this member has heard for `clientId`. */
  presenceOf(clientId: number): Record<string, unknown> | undefined {
    return this.awareness.getStates().get(clientId);
  }

  private hear(data: Uint8Array) {
    const decoder = decoding.createDecoder(data);
    const type = decoding.readVarUint(decoder);
    if (type === 0) {
      const reply = encoding.createEncoder();
      const inner = decoding.peekVarUint(decoder);
      if (inner === syncProtocol.messageYjsUpdate) this.relayed.push(data);
      syncProtocol.readSyncMessage(decoder, reply, this.doc, "server");
    } else if (type === 1) {
      awarenessProtocol.applyAwarenessUpdate(this.awareness, decoding.readVarUint8Array(decoder), "server");
    } else if (type === MESSAGE_REFUSED) {
      this.refusals.push(readRefusal(decoder).reason);
    }
  }
}

/** Joins `member` to the hub's room for `mechanismId`; false when there is no such mechanism. */
export function join(hub: CollabHub, mechanismId: string, member: TestMember): Promise<boolean> {
  return hub.admit(mechanismId, member.identity, async (accept) => accept(member.socket as unknown as WebSocket));
}
