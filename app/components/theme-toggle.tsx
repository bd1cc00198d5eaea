import { THEME_COOKIE } from "~/utils/theme";

/** Switches light/dark and remembers the choice in a cookie the server reads on render. */
export function ThemeToggle() {
  function toggle() {
    const root = document.documentElement;
    const next = root.dataset.theme === "dark" ? "light" : "dark";
    root.dataset.theme = next;
    document.cookie = `${THEME_COOKIE}=${next}; Path=/; Max-Age=31536000; SameSite=Lax`;
  }
  return (
    <button type="button" onClick={toggle} className="btn px-2" aria-label="Switch light or dark theme" title="Switch theme">
      <svg width="16" height="16" viewBox="0 0 16 16" aria-hidden="true">
        <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeWidth="1.5" />
        <path d="M8 2 A 6 6 0 0 1 8 14 Z" fill="currentColor" />
      </svg>
    </button>
  );
}
