// Which complexes co-authors are dragging right now, read from the room's awareness, so each box
// shows who holds it; and how this user tells the room about a drag of their own.
import { useCallback, useEffect, useState } from "react";
import type { Awareness } from "y-protocols/awareness";
import { presenceFields, readPresence } from "~/shared/room-document";

export interface Holder {
  name: string;
  colour: string;
}

export function useHeldComplexes(awareness: Awareness | null): { held: ReadonlyMap<string, Holder>; hold(key: string | null): void } {
  const [held, setHeld] = useState<ReadonlyMap<string, Holder>>(() => new Map());

  useEffect(() => {
    if (!awareness) return;
    const read = () => {
      const next = heldByOthers(awareness);
      // Awareness changes with every caret move; keep the old map (and its Holder objects) unless
      // a drag actually began, ended or changed hands.
      setHeld((current) => (sameHolders(current, next) ? current : next));
    };
    awareness.on("change", read);
    read();
    return () => {
      awareness.off("change", read);
      setHeld(new Map());
    };
  }, [awareness]);

  const hold = useCallback((key: string | null) => awareness?.setLocalStateField(presenceFields.graphDrag, key), [awareness]);
  return { held, hold };
}

export function heldByOthers(awareness: Pick<Awareness, "getStates" | "clientID">): Map<string, Holder> {
  const held = new Map<string, Holder>();
  awareness.getStates().forEach((state, clientId) => {
    const { user, graphDrag } = readPresence(state);
    if (clientId === awareness.clientID || typeof graphDrag !== "string" || !user?.colour) return;
    held.set(graphDrag, { name: user.name, colour: user.colour });
  });
  return held;
}

function sameHolders(a: ReadonlyMap<string, Holder>, b: ReadonlyMap<string, Holder>): boolean {
  if (a.size !== b.size) return false;
  for (const [key, holder] of a) {
    const other = b.get(key);
    if (!other || other.name !== holder.name || other.colour !== holder.colour) return false;
  }
  return true;
}
