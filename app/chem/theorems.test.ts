import { describe, expect, it } from "vitest";
import { deficiencyOneTheorem, type StructureFacts } from "./theorems";

const facts = (linkageClassDeficiencies: number[], terminalClassesPerLinkageClass: number[], deficiency: number): StructureFacts => ({
  reactionCount: 10,
  deficiency,
  linkageClassDeficiencies,
  terminalClassesPerLinkageClass,
  weaklyReversible: false,
  customLawCount: 0,
});

describe("the Deficiency One Theorem's verdict in words", () => {
  it("names the one class that breaks a hypothesis", () => {
    const verdict = deficiencyOneTheorem(facts([2, 0], [1, 3], 2));
    expect(verdict.applies).toBe(false);
    expect(verdict.conclusion).toContain("linkage class 1 has deficiency 2 (at most 1 is allowed)");
    expect(verdict.conclusion).toContain("linkage class 2 has 3 terminal strong linkage classes (exactly 1 is required)");
  });

  it("stays a sentence when dozens of classes break them (a 500-step network)", () => {
    const many = Array.from({ length: 40 }, (_, index) => (index % 2 === 0 ? 2 : 1));
    const verdict = deficiencyOneTheorem(facts(many, many, 60));
    expect(verdict.conclusion).toContain("20 linkage classes have deficiency above 1 (at most 1 is allowed): classes 1 (2), 3 (2), 5 (2), 7 (2), 9 (2), 11 (2) and 14 more");
    expect(verdict.conclusion).toContain("20 linkage classes have more than one terminal strong linkage class (exactly 1 is required): classes 1 (2), 3 (2), 5 (2), 7 (2), 9 (2), 11 (2) and 14 more");
    expect(verdict.conclusion.length).toBeLessThan(600);
  });
});
