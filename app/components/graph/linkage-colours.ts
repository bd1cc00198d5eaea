// Tints that tell linkage classes apart. Each class gets a hue; the fill and the outline are mixed
// with the theme's own surface and ink, so the same hue reads as a pale tint with a darker rim
// on paper and as a deep tint with a lighter rim at night.

/** Hue angles (OKLCH) ordered so that neighbouring classes differ strongly. */
const hues = [200, 35, 145, 300, 85, 250, 0, 175, 115, 330];

export interface ClassColours {
  /** The class's own colour, for legend swatches. */
  base: string;
  fill: string;
  outline: string;
}

export function linkageClassColours(classIndex: number): ClassColours {
  const hue = hues[((classIndex % hues.length) + hues.length) % hues.length];
  // Past the palette, later rounds shift lightness so a class never repeats an earlier one exactly.
  const round = Math.floor(classIndex / hues.length) % 3;
  const base = `oklch(${[0.62, 0.52, 0.72][round]} 0.13 ${hue})`;
  return {
    base,
    fill: `color-mix(in oklab, ${base} 17%, var(--mw-raised))`,
    outline: `color-mix(in oklab, ${base} 72%, var(--mw-ink))`,
  };
}
