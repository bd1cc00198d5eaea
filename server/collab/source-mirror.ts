// mechanisms.source follows the shared text (at most once per interval while it changes, and on
// demand), so the JSON API, the CLI and pages that do not join the room always read a recent text,
// even while co-authors type without a pause.
import type { RoomStore } from "./store";
import { Pacer } from "./pacer";

export class SourceMirror {
  private readonly pacer: Pacer;
  private writing: Promise<void> = Promise.resolve();

  constructor(
    private readonly store: RoomStore,
    private readonly mechanismId: string,
    private saved: string,
    private readonly read: () => string,
    intervalMs: number,
  ) {
    this.pacer = new Pacer(intervalMs, () => void this.flush());
  }

  changed() {
    this.pacer.request();
  }

  flush(): Promise<void> {
    this.writing = this.writing.then(async () => {
      const text = this.read();
      if (text === this.saved) return;
      try {
        await this.store.saveSource(this.mechanismId, text);
        this.saved = text;
      } catch (error) {
        console.error(`[collab] saving the text of ${this.mechanismId} failed: ${(error as Error).message}`);
      }
    });
    return this.writing;
  }

  dispose() {
    this.pacer.dispose();
  }
}
