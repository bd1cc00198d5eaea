// What the rooms and the hub need from storage, as one interface: PostgreSQL in the server
// (postgres-store.ts), rows in memory in the fast tests (memory-store.ts). Rooms stay free of SQL,
// so their logic is tested with a real Yjs document and nothing else.
import type { Role } from "../../app/shared/roles";
import type { StructureSummary } from "../../app/shared/version-diff";
import type { CollabIdentity } from "./connection";
import type { RoleChange } from "./role-feed";
import type { NewSnapshot } from "./snapshots";

/** The stored shared document: the compacted state and the updates logged since, with their row ids. */
export interface StoredDocument {
  state: Uint8Array | null;
  updates: Uint8Array[];
  ids: number[];
}

/** The live copy of a document that a compaction stores in place of its logged rows. */
export interface LiveDocument {
  /** True when the logged row `rowId` is already applied to the live document. */
  holds(rowId: number): boolean;
  /**
   * Applies `missing` (rows committed by other instances whose announcement has not arrived yet)
   * and encodes the whole document, which then covers every row through `throughUpdate`.
   */
  encode(missing: Uint8Array[], throughUpdate: number): Uint8Array;
}

/** An append found the mechanism deleted under its live room: nothing more can be stored. */
export class MechanismGone extends Error {
  override name = "MechanismGone";
}

/** What one room reads and writes. */
export interface RoomStore {
  /** The mechanism's saved text, or null when there is no such mechanism. */
  savedSource(mechanismId: string): Promise<string | null>;
  loadDocument(mechanismId: string): Promise<StoredDocument>;
  /**
   * Stores the updates as one commit, all or none, and announces them to the other instances;
   * resolves with their row ids, and rejects with MechanismGone once the mechanism is deleted.
   */
  appendUpdates(mechanismId: string, updates: Uint8Array[]): Promise<number[]>;
  /** Rows `first`…`last` that another instance announced, with the compacted state if it covers part of them. */
  committedUpdates(mechanismId: string, first: number, last: number): Promise<StoredDocument>;
  /**
   * Stores the live document as the compacted state and drops the logged updates it covers;
   * updates appended meanwhile stay. Resolves with how many were dropped.
   */
  compactDocument(mechanismId: string, live: LiveDocument): Promise<number>;
  /** Mirrors the live text into the mechanism's row. */
  saveSource(mechanismId: string, source: string): Promise<void>;
  latestSummary(mechanismId: string): Promise<StructureSummary | null>;
  insertSnapshot(snapshot: NewSnapshot): Promise<{ id: number; at: Date }>;
}

/** Rows of the access audit trail, in order. */
export interface RoleChangeRow extends RoleChange {
  id: number;
}

/** What the hub reads besides its rooms: access, versions, credentials, the audit trail. */
export interface CollabStore extends RoomStore {
  roleOf(mechanismId: string, userId: string): Promise<Role | null>;
  findSnapshotSource(mechanismId: string, snapshotId: number): Promise<{ id: number; source: string } | null>;
  /** The members among `members` whose session or API token has ended (see credentials.ts). */
  endedCredentials<M extends { identity: CollabIdentity }>(members: Iterable<M>): Promise<M[]>;
  /** The newest audit row's id (0 when there is none): the feed starts after it. */
  lastRoleChangeId(): Promise<number>;
  /** Up to `limit` audit rows after `afterId`, oldest first. */
  roleChangesAfter(afterId: number, limit: number): Promise<RoleChangeRow[]>;
}
