export type Theme = "light" | "dark";
export const THEME_COOKIE = "mw_theme";

export function themeFromCookie(header: string | null): Theme | null {
  const match = header?.match(/(?:^|;\s*)mw_theme=(light|dark)/);
  return match ? (match[1] as Theme) : null;
}
