import { describe, expect, it } from "vitest";
import { Awareness } from "y-protocols/awareness";
import * as Y from "yjs";
import { heldByOthers } from "./use-held-complexes";

describe("complexes held by co-authors", () => {
  it("lists what others drag, with their name and colour, and never this client's own drag", () => {
    const own = new Awareness(new Y.Doc());
    own.setLocalState({ user: { name: "Ada Quill", colour: "#236cc1" }, graphDrag: "X" });
    const states = own.getStates();
    states.set(own.clientID + 1, { user: { name: "Bram Okafor", colour: "#b94548" }, graphDrag: "2Y" });
    states.set(own.clientID + 2, { user: { name: "Cleo Marr", colour: "#3a7a2c" }, graphDrag: null });
    states.set(own.clientID + 3, { graphDrag: "Z" });
    expect([...heldByOthers(own)]).toEqual([["2Y", { name: "Bram Okafor", colour: "#b94548" }]]);
    own.destroy();
  });
});
