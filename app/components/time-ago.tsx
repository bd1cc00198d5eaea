import { useEffect, useState } from "react";
import { timeAgo } from "~/utils/format";

/**
 * "3 minutes ago" that hydrates cleanly. The server renders the age by its own clock; the reader's
 * clock may differ, so the first client render keeps the server's text (the mismatch on this one
 * element is expected, not an error: React #418 otherwise) and the age then follows the reader's
 * clock, refreshed each minute.
 */
export function TimeAgo({ at, className }: { at: string | Date; className?: string }) {
  const iso = typeof at === "string" ? at : at.toISOString();
  const [now, setNow] = useState<number | undefined>(undefined);
  useEffect(() => {
    setNow(Date.now());
    const timer = setInterval(() => setNow(Date.now()), 60_000);
    return () => clearInterval(timer);
  }, []);
  return (
    <time className={className} dateTime={iso} title={new Date(iso).toUTCString()} suppressHydrationWarning>
      {timeAgo(iso, now)}
    </time>
  );
}
