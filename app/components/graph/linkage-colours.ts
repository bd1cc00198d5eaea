// Tints that tell linkage classes apart. Each class gets a hue; the fill and the outline are mixed
// with the theme's own surface and ink, so the same hue reads as a pale tint with a darker rim
// on paper and as a deep tint with a lighter rim at night. Colours never run out: past the ten hues
// the rim turns dashed, then dotted, and the lightness shifts; every box also names its class on
// hover, and a folded class names itself.

/** Hue angles (OKLCH) ordered so that neighbouring classes differ strongly. */
const hues = [200, 35, 145, 300, 85, 250, 0, 175, 115, 330];
const rims = ["solid", "dashed", "dotted"] as const;
const lightness = [0.62, 0.52, 0.72];

export type RimPattern = (typeof rims)[number];

export interface ClassColours {
  /** The class's own colour, for legend swatches. */
  base: string;
  fill: string;
  outline: string;
  /** How the box's rim is drawn: the pattern changes each time the hues come round again. */
  rim: RimPattern;
}

export function linkageClassColours(classIndex: number): ClassColours {
  const index = Math.max(0, classIndex);
  const hue = hues[index % hues.length];
  const round = Math.floor(index / hues.length);
  const base = `oklch(${lightness[Math.floor(round / rims.length) % lightness.length]} 0.13 ${hue})`;
  return {
    base,
    fill: `color-mix(in oklab, ${base} 17%, var(--mw-raised))`,
    outline: `color-mix(in oklab, ${base} 72%, var(--mw-ink))`,
    rim: rims[round % rims.length],
  };
}

/** Classes before the colours repeat exactly: hues × rim patterns × lightness steps. */
export const distinctClassColours = hues.length * rims.length * lightness.length;
