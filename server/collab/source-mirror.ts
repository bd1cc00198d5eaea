// mechanisms.source follows the shared text (debounced, and on demand), so the JSON API, the CLI
// and pages that do not join the room always read the latest text.
import type { Db } from "../db/client";
import { saveSource } from "../db/mechanisms";

export class SourceMirror {
  private timer: NodeJS.Timeout | null = null;
  private writing: Promise<void> = Promise.resolve();

  constructor(
    private readonly db: Db,
    private readonly mechanismId: string,
    private saved: string,
    private readonly read: () => string,
    private readonly delayMs: number,
  ) {}

  changed() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => void this.flush(), this.delayMs);
  }

  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.writing = this.writing.then(async () => {
      const text = this.read();
      if (text === this.saved) return;
      try {
        await saveSource(this.db, this.mechanismId, text);
        this.saved = text;
      } catch (error) {
        console.error(`[collab] saving the text of ${this.mechanismId} failed: ${(error as Error).message}`);
      }
    });
    return this.writing;
  }

  dispose() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }
}
