import { describe, expect, it } from "vitest";
import { packInRows } from "./shelf-packing";

describe("packing new linkage classes in rows", () => {
  const blocks = Array.from({ length: 12 }, (_, index) => ({ width: 200 + (index % 3) * 40, height: 60 + (index % 2) * 50 }));
  const offsets = packInRows(blocks, 56);

  it("fills several rows, wider than tall, in the classes' order", () => {
    const rows = new Set(offsets.map(({ y }) => y));
    expect(rows.size).toBeGreaterThan(1);
    expect(rows.size).toBeLessThan(blocks.length);
    const right = Math.max(...offsets.map(({ x }, index) => x + blocks[index].width));
    const bottom = Math.max(...offsets.map(({ y }, index) => y + blocks[index].height));
    expect(right).toBeGreaterThan(bottom);
    for (let i = 1; i < offsets.length; i++) {
      const [a, b] = [offsets[i - 1], offsets[i]];
      expect(b.y > a.y || (b.y === a.y && b.x > a.x)).toBe(true);
    }
  });

  it("never lets two blocks overlap", () => {
    offsets.forEach((a, i) =>
      offsets.forEach((b, j) => {
        if (i >= j) return;
        const apart =
          a.x + blocks[i].width <= b.x || b.x + blocks[j].width <= a.x || a.y + blocks[i].height <= b.y || b.y + blocks[j].height <= a.y;
        expect(apart).toBe(true);
      }),
    );
  });

  it("gives a block wider than the rest a row of its own", () => {
    const [first, second] = packInRows(
      [
        { width: 5000, height: 40 },
        { width: 100, height: 40 },
      ],
      56,
    );
    expect(first).toEqual({ x: 0, y: 0 });
    expect(second.y).toBeGreaterThan(0);
  });
});
