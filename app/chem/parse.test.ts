import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildNetwork } from "./network";
import { checkSourceLimits, IncrementalMechanismParser, parseMechanism, parseMechanismWithSettings, printMechanism } from "./parse";

/** The diagnostics of a text as "severity line:column", for compact expectations. */
function where(source: string): string[] {
  return parseMechanism(source).diagnostics.map((d) => `${d.severity} ${d.line}:${d.column}`);
}

function messages(source: string): string[] {
  return parseMechanism(source).diagnostics.map((d) => d.message);
}

describe("reading steps", () => {
  it("reads every construct of the language brief", () => {
    const { mechanism, diagnostics } = parseMechanism(
      [
        "r1: X + Y -> 2Y @ k2            # irreversible",
        "X <=> 2X @ 30, 0.25",
        "Y -> 0 @ 10",
        "S -> P @ { Vmax*S/(Km + S) }",
        "k2 = 1.0e-4",
        "Vmax = 2",
        "Km = 0.5",
        "[X]0 = 1.5",
        "fixed [A] = 2.0",
        '"Fe3+" + A -> ∅ @ kf = 3',
      ].join("\n"),
    );
    expect(diagnostics).toEqual([]);
    expect(mechanism.species).toEqual(["X", "Y", "S", "P", "Fe3+"]);
    expect(mechanism.parameters).toEqual({ k2: 1e-4, Vmax: 2, Km: 0.5, kf: 3 });
    expect(mechanism.initial).toEqual({ X: 1.5 });
    expect(mechanism.fixed).toEqual({ A: 2 });
    expect(mechanism.steps[0]).toMatchObject({
      label: "r1",
      reactants: [{ coefficient: 1, species: "X" }, { coefficient: 1, species: "Y" }],
      products: [{ coefficient: 2, species: "Y" }],
      reversible: false,
      forward: { kind: "parameter", name: "k2" },
      line: 1,
    });
    expect(mechanism.steps[1]).toMatchObject({ reversible: true, forward: { kind: "value", value: 30 }, backward: { kind: "value", value: 0.25 } });
    expect(mechanism.steps[2].products).toEqual([]);
    expect(mechanism.steps[3].law).toBe("Vmax*S/(Km + S)");
  });

  it("accepts every arrow spelling", () => {
    for (const arrow of ["->", "→"]) expect(parseMechanism(`A ${arrow} B @ 1`).mechanism.steps[0].reversible).toBe(false);
    for (const arrow of ["<=>", "<->", "⇌", "⇄"]) expect(parseMechanism(`A ${arrow} B @ 1, 2`).mechanism.steps[0].reversible).toBe(true);
  });

  it("reads a coefficient with or without a space", () => {
    expect(parseMechanism("2 X + 3Y -> Z @ 1").mechanism.steps[0].reactants).toEqual([
      { coefficient: 2, species: "X" },
      { coefficient: 3, species: "Y" },
    ]);
  });

  it("keeps reading after a broken line", () => {
    const { mechanism } = parseMechanism("X + -> Y @ 1\nY -> Z @ 2\nA % B -> C\nC -> D @ 3");
    expect(mechanism.steps.map((step) => step.line)).toEqual([2, 4]);
  });
});

// Every error of the language brief, with the line and column it is reported at.
describe("errors, each with line and column", () => {
  it("unknown character", () => {
    expect(where("X -> Y @ 1\nA % B -> C @ 1")).toEqual(["error 2:3"]);
    expect(messages("A % B -> C @ 1")[0]).toContain('Unknown character "%"');
    // A no-break space pasted from a document is named, since it cannot be seen.
    expect(where("X\u00a0-> Y @ 1")).toEqual(["error 1:2"]);
    expect(messages("X\u00a0-> Y @ 1")[0]).toContain("U+00A0");
  });

  it("unterminated quoted name", () => {
    expect(where('X -> Y @ 1\nY -> "Fe3+ @ 1')).toEqual(["error 2:6"]);
    expect(messages('"Fe3+ -> Y @ 1')[0]).toContain("not closed");
  });

  it("coefficient 0", () => {
    expect(where("0X + Y -> Z @ 1")).toEqual(["error 1:1"]);
    expect(messages("Y + 0X -> Z @ 1")[0]).toContain("coefficient of 0");
  });

  it("coefficient that is not a whole number", () => {
    expect(where("1.5X -> Z @ 1")).toEqual(["error 1:1"]);
  });

  it("negative rate coefficient", () => {
    expect(where("X -> Y @ -2")).toEqual(["error 1:10"]);
    // Only the bad value is reported, not also "k is never given".
    expect(where("X -> Y @ k\nk = -1")).toEqual(["error 2:5"]);
    expect(messages("X -> Y @ -2")[0]).toContain("cannot be negative");
  });

  it("non-numeric rate coefficient", () => {
    expect(where("X -> Y @ k\nk = fast")).toEqual(["error 1:10", "error 2:5"]);
    expect(where("X -> Y @ k = fast")).toEqual(["error 1:14"]);
    expect(messages("k = fast")[0]).toContain("Expected a number");
  });

  it("reversible step with one rate", () => {
    expect(where("X <=> Y @ 1")).toEqual(["error 1:9"]);
    expect(messages("X <=> Y @ 1")[0]).toContain("two rate coefficients");
  });

  it("irreversible step with two rates", () => {
    expect(where("X -> Y @ 1, 2")).toEqual(["error 1:8"]);
  });

  it("custom law on a reversible step", () => {
    expect(where("X <=> Y @ { 2*X }")).toEqual(["error 1:11"]);
    expect(messages("X <=> Y @ { 2*X }")[0]).toContain("one direction");
  });

  it("parameter used but never given", () => {
    expect(where("X -> Y @ k1\nY -> Z @ k1")).toEqual(["error 1:10"]);
    expect(where("S -> P @ { Vmax*S }")).toEqual(["error 1:12"]);
    expect(messages("X -> Y @ k1")[0]).toContain("k1 is used but never given a value");
  });

  it("name used both as species and parameter", () => {
    expect(where("X -> Y @ X\nX = 2")).toEqual(["error 1:10"]);
    expect(where("X -> Y @ 1\nY = 2")).toEqual(["error 2:1"]);
    expect(messages("X -> Y @ 1\nY = 2")[0]).toContain("Y is a species");
  });

  it("same complex on both sides", () => {
    expect(where("X + Y -> Y + X @ 1")).toEqual(["error 1:1"]);
  });

  it("duplicate label", () => {
    expect(where("r1: X -> Y @ 1\nr1: Y -> Z @ 1")).toEqual(["error 2:1"]);
    expect(messages("r1: X -> Y @ 1\nr1: Y -> Z @ 1")[0]).toContain("already used on line 1");
  });

  it("a bare number as a complex", () => {
    expect(where("X -> 3 @ 1")).toEqual(["error 1:6"]);
  });

  it("missing arrow and missing species", () => {
    expect(where("X Y @ 1")).toEqual(["error 1:3"]);
    expect(where("X + -> Y @ 1")).toEqual(["error 1:5"]);
    expect(messages("X -> @ 1")[0]).toContain("complex after the arrow");
  });

  it("arrows that are not arrows, a second arrow, and 0 beside species", () => {
    expect(where("X => Y @ 1")).toEqual(["error 1:4"]);
    expect(messages("X => Y @ 1")[0]).toContain("Unknown arrow");
    expect(where("X -> Y -> Z @ 1")).toEqual(["error 1:9"]);
    expect(messages("X -> Y -> Z @ 1")[0]).toContain("one arrow");
    expect(messages("0 + X -> Y @ 1")[0]).toContain("stands alone");
    expect(messages("X + 2 -> Y @ 1")[0]).toContain("species after the coefficient 2");
  });

  it("a rate law mathjs cannot read, or one outside plain algebra", () => {
    expect(where("X -> Y @ { k* }")).toEqual(["error 1:14"]); // mathjs points at the end of the text
    expect(where("X -> Y @ { X > 2 }\nk = 1")).toEqual(["error 1:12"]);
    expect(messages("X -> Y @ { foo(X) }")[0]).toContain("foo() is not a function");
  });

  it("a parameter given twice", () => {
    expect(where("X -> Y @ k\nk = 1\nk = 2")).toEqual(["error 3:1"]);
  });
});

describe("warnings", () => {
  it("missing rate coefficient", () => {
    expect(where("X -> Y")).toEqual(["warning 1:1"]);
    expect(messages("X -> Y")[0]).toContain("simulation needs one");
  });

  it("duplicate steps are merged with a warning", () => {
    expect(where("X -> Y @ 1\nY <=> X @ 2, 3")).toEqual(["warning 2:1"]);
    expect(messages("X -> Y @ 1\nY + X -> X + X @ 2\nX -> Y @ 2")[0]).toContain("repeats the reaction X -> Y of line 1");
  });

  it("a rate coefficient of 0, on the step's line, for each way it can be 0", () => {
    const zero = (source: string) => parseMechanism(source).diagnostics.map(({ severity, line, message }) => ({ severity, line, message }));
    const step = "rate coefficient 0: step left out of the network";
    expect(zero("B -> C @ 1\nA -> B @ 0")).toEqual([{ severity: "warning", line: 2, message: step }]);
    expect(zero("A <=> B @ k1, k2\nk1 = 0\nk2 = 1")).toEqual([
      { severity: "warning", line: 1, message: "rate coefficient 0: forward direction left out of the network" },
    ]);
    expect(zero("A <=> B @ 0, 0")).toEqual([{ severity: "warning", line: 1, message: step }]);
    expect(zero("A + F -> B @ 2\nfixed [F] = 0")).toEqual([{ severity: "warning", line: 1, message: step }]);
    expect(zero("A -> B + F @ 2\nfixed [F] = 0")).toEqual([]); // a product held at 0 stops nothing
    expect(zero("A -> B @ { 0 }")).toEqual([]); // a custom law is not a rate coefficient
  });

  it("settings from outside the text replace values before any check, and unknown names are returned", () => {
    const source = "A + F -> B @ k1\nB -> C @ k2 = 2\nfixed [F] = 1";
    const { mechanism, diagnostics, unknown } = parseMechanismWithSettings(source, { parameters: { k1: 3, k2: 0, F: 1, k9: 1 }, initial: { A: 5, F: 1 } });
    expect(mechanism.parameters).toEqual({ k1: 3, k2: 0 });
    expect(mechanism.initial).toEqual({ A: 5 });
    expect(unknown).toEqual(["F", "k9", "[F]0"]);
    // k1 is given, so not "never given"; k2 = 0 takes its step out
    expect(diagnostics.map((d) => [d.line, d.message])).toEqual([[2, "rate coefficient 0: step left out of the network"]]);
  });

  it("declarations for species that take part in no step", () => {
    expect(where("X -> Y @ 1\n[Z]0 = 1\nfixed [W] = 2")).toEqual(["warning 2:2", "warning 3:8"]);
  });
});

describe("checkSourceLimits", () => {
  it("refuses more than 1 MiB", () => {
    expect(checkSourceLimits("#".repeat(1024 * 1024 + 1))).toMatch(/at most 1 MiB/);
    expect(checkSourceLimits("X -> Y @ 1\n")).toBeNull();
  });

  it("refuses more than 20,000 steps", () => {
    expect(checkSourceLimits("A -> B\n".repeat(20_001))).toMatch(/20,001 steps.*at most 20,000/);
    expect(checkSourceLimits("A -> B\n".repeat(20_000))).toBeNull();
  });
});

describe("properties", () => {
  const alphabet = fc.constantFrom(..."XY2 0+-><=@,.#[]{}\"\n:fixed k1=∅→⇌%e".split(""), "->", "<=>", " @ ", "\n", "fixed ");

  it("never throws and reports positions inside the text", () => {
    fc.assert(
      fc.property(fc.array(alphabet, { maxLength: 60 }).map((parts) => parts.join("")), (source) => {
        const { diagnostics } = parseMechanism(source);
        const lines = source.split("\n").length;
        for (const d of diagnostics) {
          expect(d.line).toBeGreaterThanOrEqual(1);
          expect(d.line).toBeLessThanOrEqual(lines);
          expect(d.column).toBeGreaterThanOrEqual(1);
          expect(d.message.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 400 },
    );
    fc.assert(fc.property(fc.string({ maxLength: 80 }), (source) => Array.isArray(parseMechanism(source).diagnostics)), { numRuns: 300 });
  });

  const species = fc.constantFrom("X", "Y", "Z", "A_1", '"Fe3+"', '"a b"');
  const complex = fc
    .array(fc.tuple(fc.integer({ min: 1, max: 3 }), species), { maxLength: 3 })
    .map((terms) => (terms.length === 0 ? "0" : terms.map(([n, s]) => `${n === 1 ? "" : n}${s}`).join(" + ")));
  const rate = fc.oneof(
    fc.double({ min: 0, max: 1e6, noNaN: true }).map(String),
    fc.constantFrom("k1", "k2", "kf = 2.5", "kb = 1e-3"),
  );
  const step = fc.tuple(complex, fc.boolean(), complex, rate, rate).map(([left, reversible, right, forward, backward]) =>
    reversible ? `${left} <=> ${right} @ ${forward}, ${backward}` : `${left} -> ${right} @ ${forward}`,
  );

  it("print → parse gives the same mechanism and network", () => {
    fc.assert(
      fc.property(fc.array(step, { minLength: 1, maxLength: 8 }), fc.boolean(), (steps, withFixed) => {
        const source = [...steps, "k1 = 1", "k2 = 0.5", ...(withFixed ? ["fixed [Z] = 2"] : [])].join("\n");
        const first = parseMechanism(source);
        if (first.diagnostics.some((d) => d.severity === "error")) return;
        const again = parseMechanism(printMechanism(first.mechanism));
        expect(again.diagnostics.filter((d) => d.severity === "error")).toEqual([]);
        expect(buildNetwork(again.mechanism)).toEqual(buildNetwork(first.mechanism));
        expect(again.mechanism.parameters).toEqual(first.mechanism.parameters);
        expect(again.mechanism.fixed).toEqual(first.mechanism.fixed);
      }),
      { numRuns: 300 },
    );
  });
});

describe("IncrementalMechanismParser", () => {
  const pieces = ["A", "B2", " + ", "2", " -> ", " <=> ", " @ ", "k1", "1.5e-3", ", ", "\n", "# note ", "k1 = 2\n", "[A]0 = 1\n", '"Fe3+"', "{ k1*A }", "fixed [C] = 1\n", "0", "?", ":", "r1: "];
  const edit = fc.record({ at: fc.nat(), cut: fc.nat({ max: 6 }), insert: fc.array(fc.constantFrom(...pieces), { maxLength: 4 }).map((parts) => parts.join("")) });

  it("gives what a full parse gives, edit after edit", () => {
    fc.assert(
      fc.property(fc.array(edit, { minLength: 1, maxLength: 25 }), (edits) => {
        const incremental = new IncrementalMechanismParser();
        let text = "r1: A + B -> 2B @ k1\nB -> 0 @ 0.5\nk1 = 2\n[A]0 = 1\n";
        expect(incremental.parse(text)).toEqual(parseMechanism(text));
        for (const { at, cut, insert } of edits) {
          const from = at % (text.length + 1);
          text = text.slice(0, from) + insert + text.slice(Math.min(text.length, from + cut));
          expect(incremental.parse(text)).toEqual(parseMechanism(text));
        }
      }),
      { numRuns: 300 },
    );
  });

  it("follows a text typed one character at a time, and a different text after it", () => {
    const incremental = new IncrementalMechanismParser();
    const target = 'cap: M + Q <=> MQ @ 1.1, 0.3\n"Fe3+" + X -> 2X @ kf\nkf = 0.2\n';
    for (let i = 1; i <= target.length; i++) expect(incremental.parse(target.slice(0, i))).toEqual(parseMechanism(target.slice(0, i)));
    expect(incremental.parse("X -> Y @ 3\n")).toEqual(parseMechanism("X -> Y @ 3\n"));
  });
});
