// One mechanism's live shared document on the server: the only copy of the room state, its
// connections and presence, and the services that keep it durable and analysed.
import * as awarenessProtocol from "y-protocols/awareness";
import * as Y from "yjs";
import { MAX_SOURCE_BYTES } from "../../app/chem/limits";
import { closeCodes, type Connection, type RoomPort } from "./connection";
import type { RoomStore } from "./store";
import { UpdateLog, type LoggedUpdate } from "./update-log";
import { PresenceOwners, vetAwarenessUpdate } from "./presence";
import { Pacer } from "./pacer";
import { awarenessMessage, syncStep1Message, syncStep2Message, updateMessage } from "./protocol";
import type { Analyzer } from "./analysis-entries";
import { analysisOrigin, StructureRecompute, type AnalysisResult } from "./recompute";
import { stalePositions } from "./layout-pruning";
import { AutoSnapshotPolicy, type SnapshotKind } from "./snapshots";
import { SourceMirror } from "./source-mirror";
import { replaceText } from "./text-edit";
import { UpdateCheck } from "./update-check";
import { layoutMap, sourceText } from "../../app/shared/room-document";
import type { RefusalReason } from "../../app/shared/room-refusal";

export interface RoomTimings {
  /** Shortest interval between two structure recomputes (the first after a quiet spell runs at once). */
  recomputeMs: number;
  /** Quiet period before a changed structure becomes an automatic snapshot. */
  snapshotQuietMs: number;
  /** Shortest interval between two writes of mechanisms.source while the text changes. */
  sourceMirrorMs: number;
  /** Logged updates between compactions. */
  compactEvery: number;
}

/** An edit made on a user's behalf through the HTTP API or a restore, not over a socket. */
export class ServiceEdit {
  constructor(readonly userId: string) {}
}

/** Applying stored updates while loading: nothing to log or relay. */
const loadOrigin = Symbol("mechweave-load");

/**
 * Relays of document updates are paced by what they cost: the interval is a few times the last
 * relay's sending time, and at most 16 ms. Sending to a pair of editors takes microseconds, so
 * their keystrokes go out at once; a class of 120 takes a few milliseconds a relay, so its
 * typists share a relay every ten or so and sending keeps to a fraction of the event loop.
 */
const RELAY_COST_FACTOR = 4;
const MAX_UPDATE_RELAY_MS = 16;
/**
 * The whole document, history included, stays small enough to send in one message (see
 * endpoint.ts). The room keeps a running estimate (the stored size plus every update since) and
 * encodes the document only when an update could cross the bound.
 */
const MAX_DOCUMENT_BYTES = 8 * 1024 * 1024;
/** Shortest time between two relays of presence to a room. */
const AWARENESS_RELAY_MS = 40;

const withoutNul = (text: string) => text.replaceAll("\0", "");

type UpdateOrigin = Connection | ServiceEdit | typeof analysisOrigin | typeof loadOrigin;

export class Room implements RoomPort {
  readonly connections = new Set<Connection>();
  readonly awareness: awarenessProtocol.Awareness;
  /** API calls in progress; a leased room is not unloaded. */
  leases = 0;
  private readonly presenceOwners = new PresenceOwners<Connection>();
  /** Committed updates not yet relayed, and awareness clients changed since the last relay. */
  private readonly outgoing: LoggedUpdate<UpdateOrigin>[] = [];
  private readonly awarenessChanged = new Set<number>();
  // A class joining (and so renewing its presence) at once, or twenty editors typing, then cost
  // each member a message per interval instead of one per change.
  private readonly updatePacer = new Pacer(
    () => Math.min(MAX_UPDATE_RELAY_MS, RELAY_COST_FACTOR * this.lastRelayMs),
    () => this.relayUpdates(),
  );
  private lastRelayMs = 0;
  private readonly awarenessPacer = new Pacer(AWARENESS_RELAY_MS, () => this.relayAwareness());
  private readonly text: Y.Text;
  private readonly log: UpdateLog<UpdateOrigin>;
  private readonly recompute: StructureRecompute;
  private readonly snapshots: AutoSnapshotPolicy;
  private readonly mirror: SourceMirror;
  private readonly check: UpdateCheck;
  /** An upper estimate of the encoded document, exact after each count. */
  private documentBytes: number;
  /** Logged since the last compaction: refused edits are not logged, but replaced text is. */
  private loggedBytes = 0;
  private lastEditorId: string | null = null;
  private compacting: Promise<void> | null = null;
  private closed = false;

  static async load(store: RoomStore, analyzer: Analyzer, mechanismId: string, timings: RoomTimings): Promise<Room | null> {
    const savedSource = await store.savedSource(mechanismId);
    if (savedSource === null) return null;
    const stored = await store.loadDocument(mechanismId);
    const doc = new Y.Doc();
    if (stored.state) Y.applyUpdate(doc, stored.state, loadOrigin);
    for (const update of stored.updates) Y.applyUpdate(doc, update, loadOrigin);
    if (!stored.state && stored.updates.length === 0) {
      // The first document is stored before anyone joins: initialising it again on a later load
      // would duplicate the text for clients holding the first one.
      sourceText(doc).insert(0, savedSource);
      await store.appendUpdates(mechanismId, [Y.encodeStateAsUpdate(doc)]);
    }
    return new Room(store, analyzer, mechanismId, doc, savedSource, await store.latestSummary(mechanismId), timings);
  }

  private constructor(
    private readonly store: RoomStore,
    analyzer: Analyzer,
    readonly mechanismId: string,
    readonly doc: Y.Doc,
    savedSource: string,
    lastSnapshot: Awaited<ReturnType<RoomStore["latestSummary"]>>,
    private readonly timings: RoomTimings,
  ) {
    this.text = sourceText(doc);
    this.check = new UpdateCheck(doc);
    this.documentBytes = Y.encodeStateAsUpdate(doc).byteLength;
    this.awareness = new awarenessProtocol.Awareness(doc);
    this.awareness.setLocalState(null);
    this.awareness.on("update", this.collectAwareness);
    this.log = new UpdateLog(store, mechanismId, { committed: (batch) => this.relayCommitted(batch), mechanismGone: () => this.abandon() });
    this.mirror = new SourceMirror(store, mechanismId, savedSource, () => this.text.toString(), timings.sourceMirrorMs);
    this.snapshots = new AutoSnapshotPolicy(lastSnapshot, { quietMs: timings.snapshotQuietMs, due: () => void this.autoSnapshot() });
    this.recompute = new StructureRecompute(doc, analyzer, { intervalMs: timings.recomputeMs, analyzed: (result) => this.analyzed(result) });
    doc.on("update", (update: Uint8Array, origin: UpdateOrigin) => {
      if (origin === loadOrigin) return;
      this.documentBytes += update.byteLength;
      if (origin instanceof ServiceEdit) this.lastEditorId = origin.userId;
      else if (origin !== analysisOrigin) this.lastEditorId = origin.identity.userId ?? this.lastEditorId;
      this.log.append({ update, origin });
    });
    this.text.observe(() => {
      this.recompute.schedule();
      this.mirror.changed();
    });
    // PostgreSQL's text cannot hold NUL, so the mirror and every snapshot would fail on a text
    // stored before the room refused it; such a text loses its NULs once, as the server's edit.
    const loaded = this.text.toString();
    if (loaded.includes("\0")) doc.transact(() => replaceText(this.text, withoutNul(loaded)), analysisOrigin);
    if (this.recompute.stale) this.recompute.schedule();
    if (this.text.toString() !== savedSource) void this.mirror.flush();
  }

  get idle(): boolean {
    return this.connections.size === 0 && this.leases === 0;
  }

  join(connection: Connection) {
    this.connections.add(connection);
    // Editors are asked for what the server lacks (their step 2 comes back as an edit);
    // viewers are not, since whatever they would offer is dropped anyway.
    if (connection.canEdit) connection.send(syncStep1Message(this.doc));
    this.sendAwarenessTo(connection);
  }

  leave(connection: Connection) {
    this.connections.delete(connection);
    awarenessProtocol.removeAwarenessStates(this.awareness, this.presenceOwners.release(connection), null);
  }

  /** The answer to a member's sync step 1: whatever its state vector lacks. */
  syncReply(stateVector: Uint8Array): Uint8Array {
    return syncStep2Message(this.doc, stateVector);
  }

  /** Applies an editor's update, or says why not: unreadable (the caller drops the connection) or refused. */
  applyClientUpdate(connection: Connection, update: Uint8Array): "applied" | "unreadable" | RefusalReason {
    try {
      const refusal = this.check.refusal(update) ?? (this.wouldOutgrowLimit(update) ? "text-too-large" : null) ?? this.wouldOutgrowDocument(update);
      if (refusal) return refusal;
      Y.applyUpdate(this.doc, update, connection);
      return "applied";
    } catch (error) {
      console.warn(`[collab] unreadable update from ${connection.describe()}: ${(error as Error).message}`);
      return "unreadable";
    }
  }

  private wouldOutgrowDocument(update: Uint8Array): "document-too-large" | null {
    if (this.documentBytes + update.byteLength <= MAX_DOCUMENT_BYTES) return null;
    this.documentBytes = Y.encodeStateAsUpdate(this.doc).byteLength;
    return this.documentBytes + update.byteLength <= MAX_DOCUMENT_BYTES ? null : "document-too-large";
  }

  /**
   * The text's size rule of the API holds for socket edits too. An update inserts at most as many
   * bytes as it holds and a UTF-16 unit is at most 3 bytes of UTF-8, so a keystroke into a text of
   * ordinary size costs nothing here; only an update that could cross the limit is tried on a copy.
   */
  private wouldOutgrowLimit(update: Uint8Array): boolean {
    if (this.text.length * 3 + update.byteLength <= MAX_SOURCE_BYTES) return false;
    if (Buffer.byteLength(this.text.toString()) + update.byteLength <= MAX_SOURCE_BYTES) return false;
    const trial = new Y.Doc();
    try {
      Y.applyUpdate(trial, Y.encodeStateAsUpdate(this.doc));
      Y.applyUpdate(trial, update);
      return Buffer.byteLength(sourceText(trial).toString()) > MAX_SOURCE_BYTES;
    } finally {
      trial.destroy();
    }
  }

  applyClientAwareness(connection: Connection, update: Uint8Array) {
    const vetted = vetAwarenessUpdate(update, {
      name: connection.identity.name,
      role: connection.role,
      mayControl: this.presenceOwners.mayControl(connection),
    });
    if (!vetted) return;
    if (!connection.presenceBudget.take(vetted.update.byteLength)) {
      connection.presenceDropped();
      return;
    }
    this.presenceOwners.claim(connection, vetted.clientIds);
    awarenessProtocol.applyAwarenessUpdate(this.awareness, vetted.update, connection);
  }

  sendAwarenessTo(connection: Connection) {
    const clients = [...this.awareness.getStates().keys()];
    if (clients.length > 0) connection.send(awarenessMessage(awarenessProtocol.encodeAwarenessUpdate(this.awareness, clients)));
  }

  /** Writes a whole new text as one edit by `userId`; resolves once stored and mirrored. */
  async replaceSource(source: string, userId: string) {
    // The HTTP door refuses NUL; should a caller not, the live text still never holds one.
    this.doc.transact(() => replaceText(this.text, withoutNul(source)), new ServiceEdit(userId));
    await this.log.flushed();
    await this.mirror.flush();
  }

  /** Stores the current version; the analysis is brought up to date with the text first. */
  async recordSnapshot(kind: SnapshotKind, name: string | null, authorId: string | null) {
    await this.recompute.flush();
    const latest = this.recompute.latest;
    if (!latest) throw new Error(`no analysis of ${this.mechanismId} to store with the snapshot`);
    const { summary } = latest;
    const row = await this.store.insertSnapshot({
      mechanismId: this.mechanismId,
      kind,
      name,
      source: latest.source,
      state: Y.encodeStateAsUpdate(this.doc),
      summary,
      authorId,
    });
    this.snapshots.stored(summary);
    return row;
  }

  /** Unload: the last analysis, a due snapshot, every update, the text mirror, one compaction. */
  async close() {
    if (this.closed) return;
    this.closed = true;
    this.stopRelays();
    for (const connection of this.connections) connection.close(closeCodes.goingAway, "room closing");
    try {
      await this.recompute.flush();
      if (this.snapshots.pending) await this.autoSnapshot();
    } finally {
      this.recompute.dispose();
      this.snapshots.dispose();
    }
    await this.log.flushed();
    await this.mirror.flush();
    this.mirror.dispose();
    await this.compact();
    this.doc.destroy();
  }

  /** The mechanism was deleted: nothing is left to store. */
  abandon() {
    if (this.closed) return;
    this.closed = true;
    this.stopRelays();
    for (const connection of this.connections) connection.close(closeCodes.mechanismGone, "mechanism deleted");
    this.recompute.dispose();
    this.snapshots.dispose();
    this.mirror.dispose();
    this.doc.destroy();
  }

  private relayCommitted(batch: LoggedUpdate<UpdateOrigin>[]) {
    this.outgoing.push(...batch);
    this.updatePacer.request();
    for (const { update } of batch) this.loggedBytes += update.byteLength;
    // Text pasted and deleted again leaves the document small but its log rows large.
    if (this.log.appendedSinceCompaction >= this.timings.compactEvery || this.loggedBytes >= MAX_DOCUMENT_BYTES) {
      this.log.appendedSinceCompaction = 0;
      this.loggedBytes = 0;
      void this.compact();
    }
  }

  /** Everything committed since the last relay, as one message (not back to a lone author). */
  private relayUpdates() {
    const batch = this.outgoing.splice(0);
    if (batch.length === 0) return;
    const origins = new Set(batch.map((entry) => entry.origin));
    const sender = origins.size === 1 ? batch[0].origin : null;
    const update = batch.length === 1 ? batch[0].update : Y.mergeUpdates(batch.map((entry) => entry.update));
    const started = performance.now();
    const message = updateMessage(update);
    for (const connection of this.connections) if (connection !== sender) connection.send(message);
    this.lastRelayMs = performance.now() - started;
  }

  /** Merges the log into the stored state; a failure leaves the log as it was (nothing lost). */
  private compact(): Promise<void> {
    this.compacting ??= this.store.compactDocument(this.mechanismId, () => {
      const state = Y.encodeStateAsUpdate(this.doc);
      this.documentBytes = state.byteLength;
      return state;
    })
      .then(
        () => undefined,
        (error: Error) => console.error(`[collab] compacting ${this.mechanismId} failed: ${error.message}`),
      )
      .finally(() => (this.compacting = null));
    return this.compacting;
  }

  private readonly collectAwareness = (changes: { added: number[]; updated: number[]; removed: number[] }) => {
    for (const clientId of [...changes.added, ...changes.updated, ...changes.removed]) this.awarenessChanged.add(clientId);
    if (this.awarenessChanged.size > 0) this.awarenessPacer.request();
  };

  private relayAwareness() {
    const clients = [...this.awarenessChanged];
    this.awarenessChanged.clear();
    if (clients.length === 0) return;
    const message = awarenessMessage(awarenessProtocol.encodeAwarenessUpdate(this.awareness, clients));
    for (const connection of this.connections) connection.send(message);
  }

  private stopRelays() {
    this.updatePacer.dispose();
    this.awarenessPacer.dispose();
  }

  private analyzed(result: AnalysisResult) {
    this.snapshots.observe(result.summary);
    // A text with errors may hide complexes of a line being typed: their positions stay.
    if (result.summary.errors === 0) this.pruneLayout(result.complexes);
  }

  private pruneLayout(complexes: string[]) {
    const layout = layoutMap(this.doc);
    const stale = stalePositions(layout, complexes);
    if (stale.length > 0) this.doc.transact(() => stale.forEach((key) => layout.delete(key)), analysisOrigin);
  }

  private async autoSnapshot() {
    try {
      await this.recompute.flush();
      const latest = this.recompute.latest;
      if (!latest || !this.snapshots.wants(latest.summary)) return;
      await this.recordSnapshot("auto", null, this.lastEditorId);
    } catch (error) {
      console.error(`[collab] automatic snapshot of ${this.mechanismId} failed: ${(error as Error).message}`);
    }
  }
}
