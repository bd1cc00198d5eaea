import { describe, expect, it } from "vitest";
import { completionOptions, mechanismNames } from "./complete";

describe("name completion", () => {
  it("offers species, fixed species and rate coefficient names from the text", () => {
    const names = mechanismNames('E + S <=> C @ kon, koff\nC -> E + "P+" @ kcat = 2\nfixed [A] = 1\nkon = 1\nkoff = 2');
    expect(names).toEqual({ species: ["E", "S", "C", "P+"], fixed: ["A"], parameters: ["kcat", "kon", "koff"] });
    expect(completionOptions(names, "species").map((option) => option.label)).toEqual(["E", "S", "C", '"P+"', "A"]);
    expect(completionOptions(names, "parameter").map((option) => option.label)).toEqual(["kcat", "kon", "koff"]);
  });
});
