import { describe, expect, it } from "vitest";
import { peerPalette, pickColour } from "./use-room";

/** WCAG relative luminance and contrast ratio of two #rrggbb colours. */
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((at) => {
    const channel = parseInt(hex.slice(at, at + 2), 16) / 255;
    return channel <= 0.04045 ? channel / 12.92 : ((channel + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}
const contrast = (a: string, b: string) => {
  const [light, dark] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (light + 0.05) / (dark + 0.05);
};

describe("peer colours", () => {
  it("carry white label text and show as carets on the dark canvas", () => {
    for (const colour of peerPalette) {
      expect(contrast(colour, "#ffffff")).toBeGreaterThanOrEqual(4.5);
      expect(contrast(colour, "#12161b")).toBeGreaterThanOrEqual(3);
      expect(contrast(colour, "#1a1f26")).toBeGreaterThanOrEqual(3);
    }
  });

  it("are stable for one name", () => {
    expect(pickColour("Ada Quill")).toBe(pickColour("Ada Quill"));
    expect(peerPalette).toContain(pickColour("Ada Quill"));
  });

  it("skip colours already taken while any is free", () => {
    const first = pickColour("Ada Quill");
    const second = pickColour("Ada Quill", [first]);
    expect(second).not.toBe(first);
    const taken: string[] = [];
    for (let i = 0; i < peerPalette.length; i++) taken.push(pickColour("Ada Quill", taken));
    expect(new Set(taken).size).toBe(peerPalette.length);
  });

  it("fall back to the name's own colour when every colour is taken", () => {
    expect(pickColour("Ada Quill", peerPalette)).toBe(pickColour("Ada Quill"));
  });
});
