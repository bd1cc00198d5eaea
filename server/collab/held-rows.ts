// Which logged rows the live document already holds, so a compaction reads and applies only the
// rows it lacks (another instance's, announced but not yet heard) before storing the document in
// their place. Forgetting is always safe: a row not known to be held is read and applied again,
// and applying an update twice changes nothing.
const MAX_REMEMBERED = 50_000;

export class HeldRows {
  private readonly ids = new Set<number>();

  add(ids: Iterable<number>) {
    for (const id of ids) this.ids.add(id);
    // A follower never compacts, so nothing else trims its memory.
    if (this.ids.size > MAX_REMEMBERED) this.ids.clear();
  }

  holds(id: number): boolean {
    return this.ids.has(id);
  }

  /** After a compaction through `throughUpdate`: those rows are gone from the log. */
  forgetThrough(throughUpdate: number) {
    for (const id of this.ids) if (id <= throughUpdate) this.ids.delete(id);
  }
}
