import { describe, expect, it } from "vitest";
import { readOverride, readOverrides } from "./overrides";

describe("overrides (--set and the Dynamics panel)", () => {
  it("reads parameters and initial concentrations, quoted names included", () => {
    expect(readOverride("T=1100")).toEqual({ ok: true, into: "parameters", name: "T", value: 1100 });
    expect(readOverride("[A]0=2e-3")).toEqual({ ok: true, into: "initial", name: "A", value: 2e-3 });
    expect(readOverride('["Fe3+"]0 = 0.5')).toEqual({ ok: true, into: "initial", name: "Fe3+", value: 0.5 });
  });

  it("refuses what is not NAME=VALUE with a value ≥ 0, and lets a later value win", () => {
    expect(readOverride("T")).toMatchObject({ ok: false, message: expect.stringMatching(/NAME=VALUE/) });
    expect(readOverride("T=-1")).toMatchObject({ ok: false, message: "T=-1: the value must be a number ≥ 0" });
    expect(readOverride("T=")).toMatchObject({ ok: false });
    expect(readOverrides(["T=1", "T=2", "[A]0=1"])).toEqual({ ok: true, settings: { parameters: { T: 2 }, initial: { A: 1 } } });
  });
});
