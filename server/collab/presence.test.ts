import * as awarenessProtocol from "y-protocols/awareness";
import * as Y from "yjs";
import { describe, expect, it } from "vitest";
import { PresenceBudget, vetAwarenessUpdate } from "./presence";

/** One awareness update covering the given clients' states, as a provider would send it. */
function presenceOf(states: Record<number, Record<string, unknown>>): Uint8Array {
  const awareness = new awarenessProtocol.Awareness(new Y.Doc());
  awareness.setLocalState(null);
  for (const [clientId, state] of Object.entries(states)) {
    awareness.states.set(Number(clientId), state);
    awareness.meta.set(Number(clientId), { clock: 1, lastUpdated: 0 });
  }
  return awarenessProtocol.encodeAwarenessUpdate(awareness, Object.keys(states).map(Number));
}

function statesIn(update: Uint8Array): Map<number, unknown> {
  const awareness = new awarenessProtocol.Awareness(new Y.Doc());
  awarenessProtocol.applyAwarenessUpdate(awareness, update, null);
  return new Map([...awareness.getStates()].filter(([clientId]) => clientId !== awareness.clientID));
}

const speaker = { name: "Ana Owner", role: "editor" as const, mayControl: (clientId: number) => clientId === 7 };

describe("vetAwarenessUpdate", () => {
  it("keeps the connection's own client and stamps the name and role the server knows", () => {
    const vetted = vetAwarenessUpdate(presenceOf({ 7: { user: { name: "Someone Else", color: "#123" }, cursor: 4 } }), speaker);
    expect(vetted?.clientIds).toEqual([7]);
    expect(statesIn(vetted!.update).get(7)).toEqual({ user: { name: "Ana Owner", role: "editor", color: "#123" }, cursor: 4 });
  });

  it("drops the echo of other members' presence and keeps only the connection's own", () => {
    expect(vetAwarenessUpdate(presenceOf({ 8: { user: { name: "Eli" } }, 9: { user: { name: "Vic" } } }), speaker)).toBeNull();
    const mixed = vetAwarenessUpdate(presenceOf({ 8: { user: { name: "Eli" } }, 7: { cursor: 1 } }), speaker);
    expect(mixed?.clientIds).toEqual([7]);
    expect([...statesIn(mixed!.update).keys()]).toEqual([7]);
  });

  it("refuses malformed updates and states that are not objects", () => {
    expect(vetAwarenessUpdate(new Uint8Array([1, 7]), speaker)).toBeNull();
    expect(vetAwarenessUpdate(presenceOf({ 7: { note: "x".repeat(5 * 1024) } }), speaker)).toBeNull();
  });
});

describe("PresenceBudget", () => {
  it("lets a burst through, then only what the rate refills", () => {
    let now = 0;
    const budget = new PresenceBudget(1000, 2000, () => now);
    expect(budget.take(1500)).toBe(true);
    expect(budget.take(1000)).toBe(false);
    expect(budget.take(400)).toBe(true);
    expect(budget.take(200)).toBe(false);
    now = 250;
    expect(budget.take(200)).toBe(true);
    now = 60_000;
    expect(budget.take(2001)).toBe(false);
  });
});
