import { describe, expect, it } from "vitest";
import { seededRandom } from "~/chem/seeded-random";
import { IndexedHeap } from "./indexed-heap";

describe("IndexedHeap", () => {
  it("keeps the smallest key on top through thousands of random changes", () => {
    const random = seededRandom(4);
    const keys = Float64Array.from({ length: 200 }, () => random());
    const heap = new IndexedHeap(keys);
    for (let change = 0; change < 5000; change++) {
      const j = Math.floor(random() * keys.length);
      keys[j] = random() < 0.1 ? Infinity : random() * 10;
      heap.update(j);
      const smallest = Math.min(...keys);
      expect(keys[heap.top()]).toBe(smallest);
    }
  });

  it("holds one key", () => {
    const keys = Float64Array.of(3);
    const heap = new IndexedHeap(keys);
    keys[0] = 1;
    heap.update(0);
    expect(heap.top()).toBe(0);
  });
});
