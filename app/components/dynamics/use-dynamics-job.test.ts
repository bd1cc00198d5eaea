import { describe, expect, it } from "vitest";
import { withNote } from "./use-dynamics-job";

describe("a fit's progress notes", () => {
  it("stay in iteration order however they arrive, each once", () => {
    let notes = [0, 2, 3].map((iteration) => ({ iteration, cost: 10 - iteration }));
    notes = withNote(notes, { iteration: 1, cost: 9 });
    notes = withNote(notes, { iteration: 3, cost: 7 });
    expect(notes.map(({ iteration }) => iteration)).toEqual([0, 1, 2, 3]);
  });
});
