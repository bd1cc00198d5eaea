// One mechanism's live shared document in this instance: its copy of the room state, its
// connections and presence, and the services that keep it durable and analysed. Other instances
// may hold the same room (room-link.ts): their stored edits and presence arrive here and are
// relayed like local ones, and only the leader analyses, takes versions, compacts and mirrors.
import * as awarenessProtocol from "y-protocols/awareness";
import * as Y from "yjs";
import { MAX_SOURCE_BYTES } from "../../app/chem/limits";
import { closeCodes, type Connection, type RoomPort } from "./connection";
import type { RoomStore, StoredDocument } from "./store";
import { HeldRows } from "./held-rows";
import type { LinkedRoom } from "./room-link";
import { peerOrigin, UpdateLog, type LoggedUpdate } from "./update-log";
import { PresenceOwners, vetAwarenessUpdate } from "./presence";
import { Pacer } from "./pacer";
import { awarenessMessage, syncStep1Message, syncStep2Message, updateMessage } from "./protocol";
import type { Analyzer } from "./analysis-entries";
import { analysisOrigin, StructureRecompute, type AnalysisResult } from "./recompute";
import { stalePositions } from "./layout-pruning";
import { AutoSnapshotPolicy, type SnapshotKind } from "./snapshots";
import { SourceMirror } from "./source-mirror";
import { replaceText } from "./text-edit";
import { applyTextEdits } from "../../app/shared/text-edits";
import { UpdateCheck } from "./update-check";
import { declaredValueEdits } from "../../app/chem/declared-values";
import { fitsMap, layoutMap, MAX_FIT_NOTICES, sourceText, type FitNotice } from "../../app/shared/room-document";
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

/** What the room tells the other instances holding it (room-bus.ts). */
export interface RoomPeers {
  /** Presence of local members, one awareness update per client. */
  publishPresence(updates: Uint8Array[]): void;
}

export const noPeers: RoomPeers = { publishPresence() {} };

/**
 * The first document of a mechanism is written by a fixed Yjs client, so two instances loading a
 * new mechanism at once write the very same items, which Yjs merges into one text.
 */
const FIRST_DOCUMENT_CLIENT = 0;

function firstDocument(source: string): Uint8Array {
  const doc = new Y.Doc();
  doc.clientID = FIRST_DOCUMENT_CLIENT;
  sourceText(doc).insert(0, source);
  const update = Y.encodeStateAsUpdate(doc);
  doc.destroy();
  return update;
}

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

type UpdateOrigin = Connection | ServiceEdit | typeof analysisOrigin | typeof loadOrigin | typeof peerOrigin;

export class Room implements RoomPort, LinkedRoom {
  readonly connections = new Set<Connection>();
  readonly awareness: awarenessProtocol.Awareness;
  /** API calls in progress; a leased room is not unloaded. */
  leases = 0;
  /** Clients of other instances' members are owned by `peerOrigin`: no local member may speak for them. */
  private readonly presenceOwners = new PresenceOwners<Connection | typeof peerOrigin>();
  /** Committed updates not yet relayed, and awareness clients changed since the last relay (those of local members also go to the other instances). */
  private readonly outgoing: LoggedUpdate<UpdateOrigin>[] = [];
  private readonly awarenessChanged = new Set<number>();
  private readonly presenceToShare = new Set<number>();
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
  private readonly held = new HeldRows();
  /** The leader's upkeep; null while another instance leads. */
  private recompute: StructureRecompute | null = null;
  private snapshots: AutoSnapshotPolicy | null = null;
  private readonly mirror: SourceMirror;
  private readonly check: UpdateCheck;
  /** An upper estimate of the encoded document, exact after each count. */
  private documentBytes: number;
  /** Logged since the last compaction (by any instance): refused edits are not logged, but replaced text is. */
  private loggedBytes = 0;
  private loggedRows = 0;
  private lastEditorId: string | null = null;
  private compacting: Promise<void> | null = null;
  /** Counts `follow()` calls, so a `lead()` under way notices one. */
  private followed = 0;
  private closed = false;

  /** A follower until `lead()`. */
  static async load(store: RoomStore, analyzer: Analyzer, mechanismId: string, timings: RoomTimings, peers: RoomPeers = noPeers): Promise<Room | null> {
    const savedSource = await store.savedSource(mechanismId);
    if (savedSource === null) return null;
    const stored = await store.loadDocument(mechanismId);
    const doc = new Y.Doc();
    if (stored.state) Y.applyUpdate(doc, stored.state, loadOrigin);
    for (const update of stored.updates) Y.applyUpdate(doc, update, loadOrigin);
    const held = [...stored.ids];
    if (!stored.state && stored.updates.length === 0) {
      // The first document is stored before anyone joins: initialising it again on a later load
      // would duplicate the text for clients holding the first one.
      const first = firstDocument(savedSource);
      Y.applyUpdate(doc, first, loadOrigin);
      held.push(...(await store.appendUpdates(mechanismId, [first])));
    }
    return new Room(store, analyzer, mechanismId, doc, savedSource, held, timings, peers);
  }

  private constructor(
    private readonly store: RoomStore,
    private readonly analyzer: Analyzer,
    readonly mechanismId: string,
    readonly doc: Y.Doc,
    savedSource: string,
    heldRows: number[],
    private readonly timings: RoomTimings,
    private readonly peers: RoomPeers,
  ) {
    this.held.add(heldRows);
    this.text = sourceText(doc);
    this.check = new UpdateCheck(doc);
    this.documentBytes = Y.encodeStateAsUpdate(doc).byteLength;
    this.awareness = new awarenessProtocol.Awareness(doc);
    this.awareness.setLocalState(null);
    this.awareness.on("update", this.collectAwareness);
    this.log = new UpdateLog(store, mechanismId, { committed: (batch, ids) => this.relayCommitted(batch, ids), mechanismGone: () => this.abandon() });
    this.mirror = new SourceMirror(store, mechanismId, savedSource, () => this.text.toString(), timings.sourceMirrorMs);
    doc.on("update", (update: Uint8Array, origin: UpdateOrigin) => {
      if (origin === loadOrigin) return;
      this.documentBytes += update.byteLength;
      if (origin === peerOrigin) {
        // Stored already by the instance that accepted it.
        this.outgoing.push({ update, origin });
        this.updatePacer.request();
        return;
      }
      if (origin instanceof ServiceEdit) this.lastEditorId = origin.userId;
      else if (origin !== analysisOrigin) this.lastEditorId = origin.identity.userId ?? this.lastEditorId;
      this.log.append({ update, origin });
    });
    this.text.observe(() => {
      if (!this.recompute) return;
      this.recompute.schedule();
      this.mirror.changed();
    });
    // PostgreSQL's text cannot hold NUL, so the mirror and every snapshot would fail on a text
    // stored before the room refused it; such a text loses its NULs once, as the server's edit.
    const loaded = this.text.toString();
    if (loaded.includes("\0")) doc.transact(() => replaceText(this.text, withoutNul(loaded)), analysisOrigin);
  }

  get leading(): boolean {
    return this.recompute !== null;
  }

  /** This instance now leads the room: it analyses, takes versions, compacts and mirrors the text. */
  async lead() {
    if (this.leading || this.closed) return;
    const term = this.followed;
    // Another leader may have stored versions since this room loaded.
    const lastSnapshot = await this.store.latestSummary(this.mechanismId);
    // Told to follow meanwhile (the lock went with a lost connection): this lead is void.
    if (this.leading || this.closed || term !== this.followed) return;
    this.snapshots = new AutoSnapshotPolicy(lastSnapshot, { quietMs: this.timings.snapshotQuietMs, due: () => void this.autoSnapshot() });
    // Built from the document as it is now, which holds the last leader's analysis.
    this.recompute = new StructureRecompute(this.doc, this.analyzer, { intervalMs: this.timings.recomputeMs, analyzed: (result) => this.analyzed(result) });
    if (this.recompute.stale) this.recompute.schedule();
    void this.mirror.flush();
  }

  /** Another instance leads now (or may: this one lost its link to the database). */
  follow() {
    this.followed++;
    this.recompute?.dispose();
    this.snapshots?.dispose();
    this.recompute = null;
    this.snapshots = null;
  }

  /** Rows other instances stored: applied (and so relayed), each at most once in effect. */
  applyStored(stored: StoredDocument) {
    if (this.closed) return;
    this.held.add(stored.ids);
    const updates = stored.state ? [stored.state, ...stored.updates] : stored.updates;
    if (updates.length === 0) return;
    Y.applyUpdate(this.doc, updates.length === 1 ? updates[0] : Y.mergeUpdates(updates), peerOrigin);
    this.counted(stored.ids.length, stored.updates);
  }

  applyPeerPresence(updates: Uint8Array[]) {
    if (this.closed) return;
    for (const update of updates) {
      try {
        awarenessProtocol.applyAwarenessUpdate(this.awareness, update, peerOrigin);
      } catch (error) {
        console.warn(`[collab] unreadable presence from another instance in ${this.mechanismId}: ${(error as Error).message}`);
      }
    }
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

  /** Sets the declared values in one transaction by `userId`: one update everyone gets, one version in the log. */
  async writeValues(values: Record<string, number>, userId: string): Promise<{ undeclared: string[]; previous: Record<string, number> }> {
    const { edits, undeclared, previous } = declaredValueEdits(this.text.toString(), values);
    if (undeclared.length > 0) return { undeclared, previous };
    this.doc.transact(() => applyTextEdits(this.text, edits), new ServiceEdit(userId));
    await this.log.flushed();
    await this.mirror.flush();
    return { undeclared, previous };
  }

  /** Tells every member (on every instance) that a fit started or ended; resolves once stored. */
  async announceFit(fitId: string, notice: FitNotice) {
    const notices = fitsMap(this.doc);
    this.doc.transact(() => {
      notices.set(fitId, notice);
      const oldest = [...notices.entries()].sort(([, a], [, b]) => String((a as FitNotice).at).localeCompare(String((b as FitNotice).at)));
      for (const [key] of oldest.slice(0, Math.max(0, notices.size - MAX_FIT_NOTICES))) notices.delete(key);
    }, analysisOrigin);
    await this.log.flushed();
  }

  /**
   * Stores the current version. The leader brings its analysis up to date with the text first; a
   * follower analyses the text for the version alone, leaving the room's analysis to the leader.
   */
  async recordSnapshot(kind: SnapshotKind, name: string | null, authorId: string | null) {
    const latest = await this.currentAnalysis();
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
    this.snapshots?.stored(summary);
    return row;
  }

  private async currentAnalysis(): Promise<{ source: string; summary: AnalysisResult["summary"] }> {
    if (!this.recompute) {
      const source = this.text.toString();
      return { source, summary: (await this.analyzer.analyze(source)).summary };
    }
    await this.recompute.flush();
    const latest = this.recompute.latest;
    if (!latest) throw new Error(`no analysis of ${this.mechanismId} to store with the snapshot`);
    return latest;
  }

  /** Unload: every update; the leader also stores the last analysis, a due snapshot, the text mirror and one compaction. */
  async close() {
    if (this.closed) return;
    this.closed = true;
    this.stopRelays();
    for (const connection of this.connections) connection.close(closeCodes.goingAway, "room closing");
    const leading = this.leading;
    try {
      await this.recompute?.flush();
      if (this.snapshots?.pending) await this.autoSnapshot();
    } finally {
      this.follow();
    }
    await this.log.flushed();
    if (leading) await this.mirror.flush();
    this.mirror.dispose();
    if (leading) await this.compact();
    this.doc.destroy();
  }

  /** The mechanism was deleted: nothing is left to store. */
  abandon() {
    if (this.closed) return;
    this.closed = true;
    this.stopRelays();
    for (const connection of this.connections) connection.close(closeCodes.mechanismGone, "mechanism deleted");
    this.follow();
    this.mirror.dispose();
    this.doc.destroy();
  }

  private relayCommitted(batch: LoggedUpdate<UpdateOrigin>[], ids: number[]) {
    this.held.add(ids);
    this.outgoing.push(...batch);
    this.updatePacer.request();
    this.counted(ids.length, batch.map((entry) => entry.update));
  }

  /** Counts rows logged by any instance; the leader compacts every so many. */
  private counted(rows: number, updates: Uint8Array[]) {
    this.loggedRows += rows;
    for (const update of updates) this.loggedBytes += update.byteLength;
    // Text pasted and deleted again leaves the document small but its log rows large.
    if (this.leading && (this.loggedRows >= this.timings.compactEvery || this.loggedBytes >= MAX_DOCUMENT_BYTES)) {
      this.loggedRows = 0;
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
    this.compacting ??= this.store
      .compactDocument(this.mechanismId, {
        holds: (id) => this.held.holds(id),
        encode: (missing, throughUpdate) => {
          if (missing.length > 0) Y.applyUpdate(this.doc, Y.mergeUpdates(missing), peerOrigin);
          const state = Y.encodeStateAsUpdate(this.doc);
          this.documentBytes = state.byteLength;
          this.held.forgetThrough(throughUpdate);
          return state;
        },
      })
      .then(
        () => undefined,
        (error: Error) => console.error(`[collab] compacting ${this.mechanismId} failed: ${error.message}`),
      )
      .finally(() => (this.compacting = null));
    return this.compacting;
  }

  private readonly collectAwareness = (changes: { added: number[]; updated: number[]; removed: number[] }, origin: unknown) => {
    const fromPeer = origin === peerOrigin;
    if (fromPeer) this.presenceOwners.claim(peerOrigin, [...changes.added, ...changes.updated]);
    // Gone from another instance, or timed out here after that instance stopped renewing it.
    this.presenceOwners.releaseClients(peerOrigin, changes.removed);
    for (const clientId of [...changes.added, ...changes.updated, ...changes.removed]) {
      this.awarenessChanged.add(clientId);
      if (!fromPeer) this.presenceToShare.add(clientId);
    }
    if (this.awarenessChanged.size > 0) this.awarenessPacer.request();
  };

  private relayAwareness() {
    const clients = [...this.awarenessChanged];
    this.awarenessChanged.clear();
    if (clients.length > 0) {
      const message = awarenessMessage(awarenessProtocol.encodeAwarenessUpdate(this.awareness, clients));
      for (const connection of this.connections) connection.send(message);
    }
    const shared = [...this.presenceToShare];
    this.presenceToShare.clear();
    if (shared.length > 0) this.peers.publishPresence(shared.map((clientId) => awarenessProtocol.encodeAwarenessUpdate(this.awareness, [clientId])));
  }

  private stopRelays() {
    this.updatePacer.dispose();
    this.awarenessPacer.dispose();
  }

  private analyzed(result: AnalysisResult) {
    this.snapshots?.observe(result.summary);
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
      await this.recompute?.flush();
      const latest = this.recompute?.latest;
      if (!latest || !this.snapshots?.wants(latest.summary)) return;
      await this.recordSnapshot("auto", null, this.lastEditorId);
    } catch (error) {
      console.error(`[collab] automatic snapshot of ${this.mechanismId} failed: ${(error as Error).message}`);
    }
  }
}
