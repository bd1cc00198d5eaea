// The y-websocket wire format (the open Yjs sync and awareness protocols), read into typed
// messages *before* anything is applied, so the caller can decide per role what to accept.
import * as decoding from "lib0/decoding";
import * as encoding from "lib0/encoding";
import * as sync from "y-protocols/sync";
import * as Y from "yjs";

const MESSAGE_SYNC = 0;
const MESSAGE_AWARENESS = 1;
const MESSAGE_QUERY_AWARENESS = 3;

export type ClientMessage =
  | { kind: "sync-step-1"; stateVector: Uint8Array }
  /** Sync step 2 and incremental updates both carry a document update: the edits a role may not send. */
  | { kind: "document-update"; update: Uint8Array; syncType: "step-2" | "update" }
  | { kind: "awareness"; update: Uint8Array }
  | { kind: "query-awareness" }
  | { kind: "malformed"; reason: string };

export function readClientMessage(data: Uint8Array): ClientMessage {
  try {
    const decoder = decoding.createDecoder(data);
    const outer = decoding.readVarUint(decoder);
    if (outer === MESSAGE_SYNC) {
      const inner = decoding.readVarUint(decoder);
      const payload = decoding.readVarUint8Array(decoder);
      if (inner === sync.messageYjsSyncStep1) return { kind: "sync-step-1", stateVector: payload };
      if (inner === sync.messageYjsSyncStep2) return { kind: "document-update", update: payload, syncType: "step-2" };
      if (inner === sync.messageYjsUpdate) return { kind: "document-update", update: payload, syncType: "update" };
      return { kind: "malformed", reason: `unknown sync message type ${inner}` };
    }
    if (outer === MESSAGE_AWARENESS) return { kind: "awareness", update: decoding.readVarUint8Array(decoder) };
    if (outer === MESSAGE_QUERY_AWARENESS) return { kind: "query-awareness" };
    return { kind: "malformed", reason: `unknown message type ${outer}` };
  } catch (error) {
    return { kind: "malformed", reason: (error as Error).message };
  }
}

function message(write: (encoder: encoding.Encoder) => void): Uint8Array {
  const encoder = encoding.createEncoder();
  write(encoder);
  return encoding.toUint8Array(encoder);
}

export function syncStep1Message(doc: Y.Doc): Uint8Array {
  return message((e) => {
    encoding.writeVarUint(e, MESSAGE_SYNC);
    sync.writeSyncStep1(e, doc);
  });
}

export function syncStep2Message(doc: Y.Doc, stateVector: Uint8Array): Uint8Array {
  return message((e) => {
    encoding.writeVarUint(e, MESSAGE_SYNC);
    sync.writeSyncStep2(e, doc, stateVector);
  });
}

export function updateMessage(update: Uint8Array): Uint8Array {
  return message((e) => {
    encoding.writeVarUint(e, MESSAGE_SYNC);
    sync.writeUpdate(e, update);
  });
}

export function awarenessMessage(update: Uint8Array): Uint8Array {
  return message((e) => {
    encoding.writeVarUint(e, MESSAGE_AWARENESS);
    encoding.writeVarUint8Array(e, update);
  });
}
