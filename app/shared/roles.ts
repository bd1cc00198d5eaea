export const roles = ["viewer", "editor", "owner"] as const;
export type Role = (typeof roles)[number];

/** True when `held` grants at least what `needed` does. */
export function atLeast(held: Role, needed: Role): boolean {
  return roles.indexOf(held) >= roles.indexOf(needed);
}
