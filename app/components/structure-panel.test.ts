import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { StructurePanel } from "./structure-panel";

describe("StructurePanel", () => {
  it("shows counts, verdicts, typeset ODEs, the matrix and detailed balance", async () => {
    const report = await analyzeSource("A <=> B @ k1 = 1, k2 = 2\nB <=> C @ k3 = 3, k4 = 4\nC <=> A @ k5 = 8, k6 = 3\nX -> Y");
    const html = renderToString(createElement(StructurePanel, { report, equations: report }));
    expect(html).toContain("Deficiency Zero Theorem");
    expect(html).toContain("katex");
    expect(html).toContain("terminal");
    expect(html).toContain("r6");
    expect(html).toContain("No rate coefficient");
  });

  it("warns on the line of a step with rate coefficient 0 and gives verdicts about the network without it", async () => {
    const report = await analyzeSource("A <=> B @ k1, k2\nk1 = 0\nk2 = 1");
    const html = renderToString(createElement(StructurePanel, { report, equations: report }));
    expect(html).toContain("rate coefficient 0: forward direction left out of the network");
    expect(html).not.toContain("exactly one positive steady state");
  });

  it("shows the values behind the names of an equation on hover", async () => {
    const report = await analyzeSource("A + B -> C @ k1\nC -> A @ 3e9\nk1 = 2.5e13");
    const html = renderToString(createElement(StructurePanel, { report, equations: report }));
    expect(html).toContain('title="k1 = 2.5×10¹³"');
  });

  it("writes each conserved total of the initial state and names the compatibility class", async () => {
    const report = await analyzeSource("A + B <=> AB @ 1e6, 1\n[A]0 = 3e-6\n[B]0 = 1e-6");
    const html = renderToString(createElement(StructurePanel, { report, equations: report }));
    // The laws [A] + [AB] and [B] + [AB], at 3×10⁻⁶ and 10⁻⁶ (worked by hand).
    expect(html).toContain("[\\mathrm{A}] + [\\mathrm{AB}] = 3 \\times 10^{-6}");
    expect(html).toContain("[\\mathrm{B}] + [\\mathrm{AB}] = 10^{-6}");
    expect(html).toMatch(/moves? the 3 concentrations in only 1 independent direction.*2 totals above keep their initial values/);
  });

  it("states each behaviour verdict in words: multistationarity, siphons, robust species, complex balance", async () => {
    const report = await analyzeSource("A + B -> 2B @ 1\nB -> A @ 1\n");
    const html = renderToString(createElement(StructurePanel, { report, equations: report }));
    expect(html).toContain("Several steady states in one class");
    expect(html).toContain("Minimal siphons: <span class=\"font-mono\">{B}</span>");
    expect(html).toMatch(/Shinar–Feinberg theorem/);
    expect(html).toContain("Complex balance for these coefficients");
  });

  it("says the equations are on their way until the room's have been read", async () => {
    const html = renderToString(createElement(StructurePanel, { report: await analyzeSource("A -> B @ 1"), equations: null }));
    expect(html).toContain("Reading the equations…");
    expect(html).toContain("Deficiency Zero Theorem");
  });

  it("renders an empty mechanism without failing", async () => {
    const report = await analyzeSource("");
    const html = renderToString(createElement(StructurePanel, { report, equations: report }));
    expect(html).toContain("There are no reactions yet");
  });
});
