// Size limits checked before parsing, so that one oversized paste cannot stall a shared room.
/** The largest mechanism text anywhere: editor, live document, API and database. */
export const MAX_SOURCE_BYTES = 1024 * 1024;
const maxSteps = 20_000;
const arrow = /->|→|<=>|<->|⇌|⇄/;

/** A message refusing the text, or null when it is within the limits. */
export function checkSourceLimits(source: string): string | null {
  const bytes = source.length > MAX_SOURCE_BYTES ? source.length : new TextEncoder().encode(source).length;
  if (bytes > MAX_SOURCE_BYTES) {
    return `This mechanism is ${(bytes / MAX_SOURCE_BYTES).toFixed(1)} MiB of text; Mechweave reads at most 1 MiB.`;
  }
  let steps = 0;
  for (const line of source.split("\n")) {
    const hash = line.indexOf("#");
    if (arrow.test(hash < 0 ? line : line.slice(0, hash))) steps++;
  }
  if (steps > maxSteps) {
    return `This mechanism has ${steps.toLocaleString("en")} steps; Mechweave analyses at most ${maxSteps.toLocaleString("en")}.`;
  }
  return null;
}
