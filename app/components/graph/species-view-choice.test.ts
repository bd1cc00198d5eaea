import { describe, expect, it } from "vitest";
import { defaultSpeciesViewChoice, readSpeciesViewChoice } from "./species-view-choice";

describe("the reader's species–step view choice", () => {
  it("reads back what was stored", () => {
    expect(readSpeciesViewChoice(JSON.stringify({ hubs: "hidden", threshold: 9, focusOnly: true }))).toEqual({ hubs: "hidden", threshold: 9, focusOnly: true });
  });

  it("falls back to the default on nothing, on a broken store and on values out of range", () => {
    expect(readSpeciesViewChoice(null)).toEqual(defaultSpeciesViewChoice);
    expect(readSpeciesViewChoice("{not json")).toEqual(defaultSpeciesViewChoice);
    expect(readSpeciesViewChoice(JSON.stringify({ hubs: "everywhere", threshold: 9, focusOnly: false }))).toEqual(defaultSpeciesViewChoice);
    expect(readSpeciesViewChoice(JSON.stringify({ hubs: "copies", threshold: 1, focusOnly: false }))).toEqual(defaultSpeciesViewChoice);
  });
});
