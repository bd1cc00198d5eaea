// One diverging scale for the Fit panel's coloured cells (correlations, sensitivities): teal for
// negative, copper for positive, the canvas for zero, so a reader sees sign and strength at once.
// The two ends are the first two hues of the chart palette (dynamics/palette.ts).
const negative = [0x0f, 0x8a, 0x8c];
const positive = [0xc4, 0x62, 0x2d];

/** The cell's colour for a value in [-1, 1] (clamped), as rgba over the page's own canvas. */
export function divergingColour(value: number): string {
  if (!Number.isFinite(value)) return "transparent";
  const strength = Math.min(1, Math.abs(value));
  const [r, g, b] = value < 0 ? negative : positive;
  return `rgba(${r}, ${g}, ${b}, ${(0.08 + 0.82 * strength).toFixed(3)})`;
}

/** Text on a strong cell is light, on a pale one dark. */
export function cellInk(value: number): string {
  return Math.abs(value) > 0.55 ? "#ffffff" : "inherit";
}
