import { describe, expect, it } from "vitest";
import { parseMechanism } from "~/chem/parse";
import { continueEquilibria } from "./continuation";

const brusselator = (a: number) => parseMechanism(`fixed [A] = ${a}
fixed [B] = 1
A -> X @ 1
2X + Y -> 3X @ 1
B + X -> Y + D @ 1
X -> E @ 1
fixed [D] = 0
fixed [E] = 0`).mechanism;

const schloegl = parseMechanism(`fixed [A] = 6
fixed [B] = 5
A + 2X <=> 3X @ 1, 1
X <=> B @ 11, 1`).mechanism;

describe("continuation", () => {
  it("brusselator", () => {
    const r = continueEquilibria(brusselator(1.5), { target: { kind: "fixed", species: "B" }, from: 1, to: 5 });
    console.log(r.summary, r.bifurcations, r.points.length);
  });
  it("schloegl", () => {
    const r = continueEquilibria(schloegl, { target: { kind: "fixed", species: "B" }, from: 5, to: 7 });
    console.log(r.summary, r.bifurcations, r.points.length);
  });
});
