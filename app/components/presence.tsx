// Who is in the room: a row of initials in each person's colour, their names and roles on hover
// and in the accessible label, and how many are only watching.
import type { Peer, PeerUser } from "~/utils/use-room";

export interface PresenceProps {
  /** This user, shown first. */
  self: PeerUser;
  /** Everyone else connected (several tabs of one person count once). */
  peers: readonly Peer[];
  /** Avatars beyond this many collapse into a "+n". */
  max?: number;
}

export function Presence({ self, peers, max = 6 }: PresenceProps) {
  const people = [self, ...distinctPeople(peers).filter((peer) => !samePerson(peer, self))];
  const viewers = people.filter((person) => person.role === "viewer").length;
  const shown = people.slice(0, max);
  const hidden = people.length - shown.length;
  return (
    <div className="flex items-center gap-3 text-xs text-muted" data-testid="presence">
      <ul className="flex -space-x-1.5" aria-label={`${people.length} here`}>
        {shown.map((person, index) => (
          <li key={`${person.name}/${person.role}`} title={`${person.name}${index === 0 ? " (you)" : ""} · ${person.role}`}>
            <Avatar person={person} />
            <span className="sr-only">
              {person.name}
              {index === 0 ? " (you)" : ""}, {person.role}
            </span>
          </li>
        ))}
        {hidden > 0 && (
          <li
            className="flex h-7 min-w-7 items-center justify-center rounded-full border-2 border-surface bg-raised px-1 text-[11px] font-medium text-ink"
            title={people
              .slice(max)
              .map((p) => p.name)
              .join(", ")}
          >
            +{hidden}
          </li>
        )}
      </ul>
      <span>{people.length === 1 ? "only you" : `${people.length} here${viewers > 0 ? ` · ${viewers} viewing` : ""}`}</span>
    </div>
  );
}

function Avatar({ person }: { person: PeerUser }) {
  return (
    <span
      className="relative flex h-7 w-7 items-center justify-center rounded-full border-2 border-surface text-[11px] font-semibold text-white"
      style={{ background: person.colour }}
      aria-hidden="true"
    >
      {initials(person.name)}
      {person.role === "viewer" && (
        // A muted dot marks someone who can only watch, so roles read without the tooltip.
        <span className="absolute -right-0.5 -bottom-0.5 h-2.5 w-2.5 rounded-full border-2 border-surface bg-muted" />
      )}
    </span>
  );
}

export function initials(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  if (words.length === 0) return "?";
  const letters = words.length === 1 ? [...words[0]].slice(0, 2) : [[...words[0]][0], [...words[words.length - 1]][0]];
  return letters.join("").toUpperCase();
}

const samePerson = (a: PeerUser, b: PeerUser) => a.name === b.name && a.role === b.role;

function distinctPeople(peers: readonly Peer[]): Peer[] {
  const seen: Peer[] = [];
  for (const peer of peers) if (!seen.some((other) => samePerson(other, peer))) seen.push(peer);
  return seen;
}
