/**
 * Items written as "X, Y and Z" for a sentence; past `most` of them, the first `most` and a count:
 * "X, Y, Z and 12 more", so a verdict on a 500-step network stays a sentence.
 */
export function listed(items: string[], most = Infinity): string {
  if (items.length > most) return `${items.slice(0, most).join(", ")} and ${items.length - most} more`;
  return items.length < 2 ? items.join("") : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}
