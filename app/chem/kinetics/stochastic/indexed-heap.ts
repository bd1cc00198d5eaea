// An indexed binary min-heap over the reactions' next firing times (Gibson & Bruck's "indexed
// priority queue"): the earliest is at the top, and one reaction's time can change in O(log M)
// because each reaction knows its place in the heap.

export class IndexedHeap {
  /** heap[p]: the reaction at place p. */
  private readonly heap: Int32Array;
  /** place[j]: where reaction j sits in `heap`. */
  private readonly place: Int32Array;

  constructor(private readonly keys: Float64Array) {
    this.heap = Int32Array.from(keys, (_, j) => j);
    this.place = Int32Array.from(keys, (_, j) => j);
    for (let p = (keys.length >> 1) - 1; p >= 0; p--) this.down(p);
  }

  /** The reaction with the smallest key. */
  top(): number {
    return this.heap[0];
  }

  /** Restores the order after `keys[j]` changed. */
  update(j: number): void {
    const p = this.place[j];
    if (p > 0 && this.keys[j] < this.keys[this.heap[(p - 1) >> 1]]) this.up(p);
    else this.down(p);
  }

  private up(p: number): void {
    const { heap, keys } = this;
    const j = heap[p];
    while (p > 0) {
      const parent = (p - 1) >> 1;
      if (keys[heap[parent]] <= keys[j]) break;
      this.put(p, heap[parent]);
      p = parent;
    }
    this.put(p, j);
  }

  private down(p: number): void {
    const { heap, keys } = this;
    const j = heap[p];
    const n = heap.length;
    for (;;) {
      let child = 2 * p + 1;
      if (child >= n) break;
      if (child + 1 < n && keys[heap[child + 1]] < keys[heap[child]]) child++;
      if (keys[heap[child]] >= keys[j]) break;
      this.put(p, heap[child]);
      p = child;
    }
    this.put(p, j);
  }

  private put(p: number, j: number): void {
    this.heap[p] = j;
    this.place[j] = p;
  }
}
