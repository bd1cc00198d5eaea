import { describe, expect, it } from "vitest";
import { initials } from "./presence";

describe("initials", () => {
  it("take the first and last word's first letters", () => {
    expect(initials("Ada Quill")).toBe("AQ");
    expect(initials("  maria de la Vega ")).toBe("MV");
  });

  it("take two letters of a single name and survive an empty one", () => {
    expect(initials("Ondine")).toBe("ON");
    expect(initials("")).toBe("?");
    expect(initials("Ève")).toBe("ÈV");
  });
});
