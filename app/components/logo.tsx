/** Mechweave's mark: two complexes joined by a forward and a backward strand. */
export function Logo({ size = 26 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true">
      <path d="M8 12 C 13 5, 19 5, 24 12" fill="none" stroke="var(--mw-accent)" strokeWidth="2.4" strokeLinecap="round" />
      <path d="M24 20 C 19 27, 13 27, 8 20" fill="none" stroke="var(--mw-signal)" strokeWidth="2.4" strokeLinecap="round" />
      <circle cx="7" cy="16" r="4.5" fill="var(--mw-accent)" />
      <circle cx="25" cy="16" r="4.5" fill="var(--mw-signal)" />
    </svg>
  );
}
