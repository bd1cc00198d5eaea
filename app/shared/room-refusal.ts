// The room's answer to a document update it will not apply, shared by the server that sends it
// and the browser that shows it. Outer message types 0–3 belong to the y-websocket protocol;
// this one is ours. The client answers it by dropping its copy and syncing a fresh one, since its
// later edits build on the refused one and the server could apply none of them.
import * as decoding from "lib0/decoding";
import * as encoding from "lib0/encoding";

export const MESSAGE_REFUSED = 7;

export const refusalReasons = {
  "text-too-large": "The change was not saved: the text would be over 1 MiB.",
  "nul-character": "The change was not saved: the text may not contain NUL characters.",
  "document-too-large": "The change was not saved: the shared document would be too large.",
  shape: "The change was not saved: it writes something the shared document does not hold.",
  "out-of-step": "The change was not saved: it builds on an edit the server refused.",
} as const;

export type RefusalReason = keyof typeof refusalReasons;

export interface Refusal {
  reason: RefusalReason;
  message: string;
}

export function encodeRefusal(reason: RefusalReason): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, MESSAGE_REFUSED);
  encoding.writeVarString(encoder, reason);
  return encoding.toUint8Array(encoder);
}

/** Reads the rest of a refusal after its type; an unknown reason still gets a message. */
export function readRefusal(decoder: decoding.Decoder): Refusal {
  const reason = decoding.readVarString(decoder);
  if (reason in refusalReasons) return { reason: reason as RefusalReason, message: refusalReasons[reason as RefusalReason] };
  return { reason: "shape", message: refusalReasons.shape };
}
