// The storage and analysis a room needs, kept in this process: rows in maps and arrays instead of
// PostgreSQL, the analysis on the event loop instead of worker threads. The fast tests of the
// room, hub and connection logic run on these with a real Yjs document; the server never does.
import { analyzeSource } from "../../app/chem/analysis";
import type { Role } from "../../app/shared/roles";
import type { StructureSummary } from "../../app/shared/version-diff";
import { analysisEntries, type Analyzer } from "./analysis-entries";
import type { CollabIdentity } from "./connection";
import type { RoleChange } from "./role-feed";
import type { NewSnapshot } from "./snapshots";
import { MechanismGone, type CollabStore, type LiveDocument, type RoleChangeRow, type StoredDocument } from "./store";

/** The same entries the worker threads produce, computed here (no incremental parse, no cache). */
export const inProcessAnalyzer: Analyzer = {
  analyze: async (source) => analysisEntries(await analyzeSource(source)),
  stop() {},
};

interface StoredSnapshot extends NewSnapshot {
  id: number;
  at: Date;
}

export class MemoryCollabStore implements CollabStore {
  /** Mechanism id → its saved text (the `mechanisms.source` column). */
  readonly sources = new Map<string, string>();
  /** The `doc_states` rows. */
  readonly states = new Map<string, Uint8Array>();
  /** The `doc_updates` rows, in insertion order. */
  readonly updates: { id: number; mechanismId: string; update: Uint8Array }[] = [];
  readonly snapshots: StoredSnapshot[] = [];
  /** `${mechanismId}/${userId}` → role, as the memberships would answer. */
  readonly roles = new Map<string, Role>();
  /** Live session id → its user, and live API token ids. */
  readonly sessions = new Map<string, string>();
  readonly tokens = new Set<string>();
  readonly roleChanges: RoleChangeRow[] = [];
  private lastId = 0;

  addMechanism(mechanismId: string, source: string) {
    this.sources.set(mechanismId, source);
  }

  /** Deletes the mechanism and, as the foreign keys cascade, its document rows. */
  deleteMechanism(mechanismId: string) {
    this.sources.delete(mechanismId);
    this.states.delete(mechanismId);
    this.updates.splice(0, this.updates.length, ...this.updates.filter((row) => row.mechanismId !== mechanismId));
  }

  setRole(mechanismId: string, userId: string, role: Role | null) {
    if (role) this.roles.set(`${mechanismId}/${userId}`, role);
    else this.roles.delete(`${mechanismId}/${userId}`);
  }

  /** Appends an audit row, as every access change does. */
  recordRoleChange(change: RoleChange) {
    this.roleChanges.push({ id: ++this.lastId, ...change });
  }

  updatesOf(mechanismId: string): Uint8Array[] {
    return this.updates.filter((row) => row.mechanismId === mechanismId).map((row) => row.update);
  }

  async savedSource(mechanismId: string) {
    return this.sources.get(mechanismId) ?? null;
  }

  async loadDocument(mechanismId: string): Promise<StoredDocument> {
    const rows = this.updates.filter((row) => row.mechanismId === mechanismId);
    return { state: this.states.get(mechanismId) ?? null, updates: rows.map((row) => row.update), ids: rows.map((row) => row.id) };
  }

  /** One process holds every room here: nobody else is told. */
  async appendUpdates(mechanismId: string, updates: Uint8Array[]) {
    if (updates.length === 0) return [];
    if (!this.sources.has(mechanismId)) throw new MechanismGone(`mechanism ${mechanismId} was deleted`);
    return updates.map((update) => {
      this.updates.push({ id: ++this.lastId, mechanismId, update });
      return this.lastId;
    });
  }

  async committedUpdates(mechanismId: string, first: number, last: number): Promise<StoredDocument> {
    const rows = this.updates.filter((row) => row.mechanismId === mechanismId && row.id >= first && row.id <= last);
    return { state: null, updates: rows.map((row) => row.update), ids: rows.map((row) => row.id) };
  }

  async compactDocument(mechanismId: string, live: LiveDocument) {
    const covered = this.updates.filter((row) => row.mechanismId === mechanismId);
    if (covered.length === 0) return 0;
    const throughUpdate = covered[covered.length - 1].id;
    const missing = covered.filter((row) => !live.holds(row.id)).map((row) => row.update);
    this.states.set(mechanismId, live.encode(missing, throughUpdate));
    this.updates.splice(0, this.updates.length, ...this.updates.filter((row) => row.mechanismId !== mechanismId || row.id > throughUpdate));
    return covered.length;
  }

  async saveSource(mechanismId: string, source: string) {
    if (this.sources.has(mechanismId)) this.sources.set(mechanismId, source);
  }

  async latestSummary(mechanismId: string): Promise<StructureSummary | null> {
    return this.snapshots.findLast((row) => row.mechanismId === mechanismId)?.summary ?? null;
  }

  async insertSnapshot(snapshot: NewSnapshot) {
    const row = { ...snapshot, id: ++this.lastId, at: new Date() };
    this.snapshots.push(row);
    return { id: row.id, at: row.at };
  }

  async roleOf(mechanismId: string, userId: string) {
    return this.roles.get(`${mechanismId}/${userId}`) ?? null;
  }

  async findSnapshotSource(mechanismId: string, snapshotId: number) {
    const row = this.snapshots.find((s) => s.mechanismId === mechanismId && s.id === snapshotId);
    return row ? { id: row.id, source: row.source } : null;
  }

  async endedCredentials<M extends { identity: CollabIdentity }>(members: Iterable<M>): Promise<M[]> {
    return [...members].filter(({ identity: { credential, userId } }) => {
      if (!credential) return false;
      if ("sessionId" in credential) return this.sessions.get(credential.sessionId) !== userId;
      return !this.tokens.has(credential.tokenId);
    });
  }

  async lastRoleChangeId() {
    return this.roleChanges.at(-1)?.id ?? 0;
  }

  async roleChangesAfter(afterId: number, limit: number) {
    return this.roleChanges.filter((row) => row.id > afterId).slice(0, limit);
  }
}
