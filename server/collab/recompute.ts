// The server's structure analysis of the shared text, recomputed shortly after every change and
// written into the `analysis` map. Only the server may write that map: an editor's write to it is
// refused before it is applied (update-check.ts), and a deletion, which names no map, is put back
// at once (see `repair`). These writes are logged like any other update, so a
// reload shows the last analysis; a restore puts back only the text, so they never get in its way.
import { createHash } from "node:crypto";
import * as Y from "yjs";
import { analysisFields, roomAnalysisReader } from "../../app/shared/analysis-map";
import { analysisMap, sourceText } from "../../app/shared/room-document";
import { summarizeStructure, type StructureSummary } from "../../app/shared/version-diff";
import type { Analyzer } from "./analysis-entries";
import { Pacer } from "./pacer";
import { peerOrigin } from "./update-log";

/** The map's packed values, each written only when its bytes changed. */
const packedFields = [analysisFields.report, analysisFields.equations] as const;

/** The transaction origin of the server's own writes into the document. */
export const analysisOrigin = Symbol("mechweave-analysis");

export interface AnalysisResult {
  source: string;
  summary: StructureSummary;
  complexes: string[];
  revision: number;
}

export function sourceDigest(source: string): string {
  return createHash("sha256").update(source).digest("base64url").slice(0, 22);
}

export class StructureRecompute {
  private readonly pacer: Pacer;
  private running: Promise<void> = Promise.resolve();
  private disposed = false;
  private readonly text: Y.Text;
  private readonly analysis: Y.Map<unknown>;
  /** Values last written, so unchanged ones are not re-sent to every client: counts as JSON text, and the packed values. */
  private readonly written = new Map<string, string>();
  private readonly writtenPacked = new Map<string, Uint8Array>();
  latest: AnalysisResult | null = null;
  private lastDurationMs = 0;

  constructor(
    private readonly doc: Y.Doc,
    private readonly analyzer: Analyzer,
    private readonly options: { intervalMs: number; analyzed(result: AnalysisResult): void },
  ) {
    this.pacer = new Pacer(
      () => Math.max(options.intervalMs, 2 * this.lastDurationMs),
      () => void this.enqueue(false),
    );
    this.text = sourceText(doc);
    this.analysis = analysisMap(doc);
    for (const [key, value] of this.analysis.entries()) {
      if (value instanceof Uint8Array) this.writtenPacked.set(key, value);
      else this.written.set(key, JSON.stringify(value));
    }
    const stored = roomAnalysisReader()(this.analysis).report;
    if (stored && !this.stale) {
      const revision = Number(this.analysis.get(analysisFields.revision)) || 0;
      this.latest = { source: this.text.toString(), summary: summarizeStructure(stored), complexes: stored.complexes, revision };
    }
    this.analysis.observe(this.watch);
  }

  /**
   * Writes into the map not the server's are put right. Another instance's writes (peerOrigin)
   * are a former leader's analysis, left alone unless they delete: two instances leading for a
   * moment must not rewrite each other's values without end.
   */
  private readonly watch = (event: Y.YMapEvent<unknown>) => {
    const { origin } = event.transaction;
    if (origin === analysisOrigin) return;
    if (origin === peerOrigin && ![...event.changes.keys.values()].some((change) => change.action === "delete")) return;
    this.repair([...event.keysChanged]);
  };

  /** True when the stored analysis belongs to a different text, or there is none in today's form. */
  get stale(): boolean {
    return (
      this.analysis.get(analysisFields.digest) !== sourceDigest(this.text.toString()) ||
      // A room stored before the equations travelled apart has none yet.
      packedFields.some((field) => !(this.analysis.get(field) instanceof Uint8Array))
    );
  }

  /**
   * At most one recompute per interval, so steady typing still sees fresh results, and none
   * waiting when the room was quiet. The interval is never shorter than twice the last analysis:
   * a large network keeps a worker busy at most half the time instead of queueing analyses of
   * texts that are already outdated.
   */
  schedule() {
    if (!this.disposed) this.pacer.request();
  }

  /** Runs a recompute now and resolves when the analysis matches the current text. */
  async flush(): Promise<void> {
    await this.enqueue(false);
  }

  /** Stops for good: this instance no longer leads, or the room is closing. */
  dispose() {
    this.disposed = true;
    this.pacer.dispose();
    this.analysis.unobserve(this.watch);
  }

  /** Rewrites keys a client changed, with the server's values. */
  private repair(keys: string[]) {
    for (const key of keys) {
      this.written.delete(key);
      this.writtenPacked.delete(key);
    }
    void this.enqueue(true);
  }

  private enqueue(force: boolean): Promise<void> {
    this.running = this.running.then(() => this.run(force));
    return this.running;
  }

  private async run(force: boolean) {
    if (this.disposed) return;
    const source = this.text.toString();
    const digest = sourceDigest(source);
    if (!force && this.latest && this.analysis.get(analysisFields.digest) === digest) return;
    let outcome;
    const started = performance.now();
    try {
      outcome = await this.analyzer.analyze(source);
    } catch (error) {
      console.error(`[collab] analysis failed: ${(error as Error).message}`);
      if (!this.disposed) this.showFailure(error as Error);
      return;
    } finally {
      this.lastDurationMs = performance.now() - started;
    }
    if (this.disposed) return;
    // Revisions keep growing across reloads: the last one is in the stored document.
    const revision = Math.max(Number(this.analysis.get(analysisFields.revision)) || 0, this.latest?.revision ?? 0) + 1;
    const entries = { ...outcome.entries, [analysisFields.digest]: JSON.stringify(digest), [analysisFields.revision]: JSON.stringify(revision) };
    this.doc.transact(() => {
      if (this.analysis.has(analysisFields.failure)) this.analysis.delete(analysisFields.failure);
      this.written.delete(analysisFields.failure);
      for (const [key, serialised] of Object.entries(entries)) {
        if (this.written.get(key) === serialised) continue;
        this.analysis.set(key, JSON.parse(serialised));
        this.written.set(key, serialised);
      }
      for (const field of packedFields) {
        const packed = outcome[field];
        const written = this.writtenPacked.get(field);
        if (written && Buffer.from(packed).equals(written)) continue;
        this.analysis.set(field, packed);
        this.writtenPacked.set(field, packed);
      }
    }, analysisOrigin);
    this.latest = { source, summary: outcome.summary, complexes: outcome.complexes, revision };
    this.options.analyzed(this.latest);
  }

  /**
   * Tells the room why the analysis of this text is missing (over the time limit, say), so the
   * panels show a message instead of waiting; the last good report stays until one replaces it.
   */
  private showFailure(error: Error) {
    const message = error.name === "AnalysisTimeout" ? error.message : `The analysis of this text failed: ${error.message.split("\n")[0]}`;
    const serialised = JSON.stringify(message);
    if (this.written.get(analysisFields.failure) === serialised) return;
    this.doc.transact(() => this.analysis.set(analysisFields.failure, message), analysisOrigin);
    this.written.set(analysisFields.failure, serialised);
  }
}
