import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { parseMechanism } from "~/chem/parse";
import { demoMechanisms } from "../../../server/seed/demo";
import { exportLatex } from "./latex";

async function latexOf(source: string, title?: string): Promise<string> {
  const parsed = parseMechanism(source);
  expect(parsed.diagnostics.filter((each) => each.severity === "error")).toEqual([]);
  return exportLatex(parsed.mechanism, await analyzeSource(source), { title });
}

/** Names and a title full of characters that LaTeX treats specially, or cannot read as they are. */
const awkward = `bind_1: "Fe3+" + "a^b~c\\d" <=> "x_{1}" @ k_on = 2.5e-3, 0.4
"50% $#&" -> 2 "café" @ { Vmax*Km*k*S }
"α-glucose" + "ł⁺₂" -> 0 @ 1e-7
"日本" -> "Fe3+" @ { Vmax * min(1, Km) / (Km + 1) }
0 -> "α-glucose"
Vmax = 3
Km = 0.5
k = 2
S = 1
["Fe3+"]0 = 1
fixed ["50% $#&"] = 2
`;

/** Braces balance once escaped braces and line breaks are set aside, and environments nest. */
function expectBalanced(latex: string): void {
  const bare = latex.replace(/\\\\/g, "").replace(/\\[{}]/g, "");
  let depth = 0;
  for (const char of bare) {
    if (char === "{") depth++;
    if (char === "}") depth--;
    expect(depth).toBeGreaterThanOrEqual(0);
  }
  expect(depth).toBe(0);
  const open: string[] = [];
  for (const [, kind, name] of bare.matchAll(/\\(begin|end)\{([^}]*)\}/g)) {
    if (kind === "begin") open.push(name);
    else expect(open.pop()).toBe(name);
  }
  expect(open).toEqual([]);
}

const pdflatex = (() => {
  try {
    return execFileSync("which", ["pdflatex"], { encoding: "utf8" }).trim() || null;
  } catch {
    return null;
  }
})();

describe("LaTeX export", () => {
  it("writes a complete article with the steps over arrows and the ODEs in align*", async () => {
    const latex = await latexOf(demoMechanisms[0].source, demoMechanisms[0].title);
    expect(latex).toMatch(/^\\documentclass\[11pt\]\{article\}\n\\usepackage\{amsmath\}\n/);
    expect(latex).toContain("\\title{Autocatalytic dye bleaching}");
    expect(latex).toContain("\\text{init:}\\quad & D + O \\xrightarrow{k_{\\mathrm{init}}} R");
    expect(latex).toContain("\\text{decay:}\\quad & R \\xrightarrow{0.05} \\emptyset");
    expect(latex).toContain("\\frac{d[\\mathrm{R}]}{dt} &= ");
    expect(latex.trimEnd().endsWith("\\end{document}")).toBe(true);
    expectBalanced(latex);
  });

  it("puts both coefficients on a reversible arrow", async () => {
    const latex = await latexOf(demoMechanisms[4].source);
    expect(latex).toContain("2\\,M \\mathrel{\\underset{\\mathrm{kb}}{\\overset{\\mathrm{kf}}{\\rightleftharpoons}}} M_{2}");
  });

  it("escapes every special character and writes ASCII only", async () => {
    const latex = await latexOf(awkward, 'Fe³⁺ & friends: 50% {done} #1 ~x^y_z \\ "quoted" <a|b>');
    expect(latex).toMatch(/^[\x00-\x7F]*$/);
    expect(latex).toContain(
      "\\title{Fe\\ensuremath{^{3}}\\ensuremath{^{+}} \\& friends: 50\\% \\{done\\} \\#1 \\~{}x\\^{}y\\_z \\textbackslash{} {''}quoted{''} \\textless{}a\\textbar{}b\\textgreater{}}",
    );
    expect(latex).toContain("\\text{bind\\_1:}");
    expect(latex).toContain("\\mathrm{a\\text{\\^{}}b\\text{\\~{}}c\\backslash d}");
    expect(latex).toContain("\\mathrm{50\\% \\$\\#\\&}");
    expect(latex).toContain("\\mathrm{caf\\text{\\'{e}}}");
    expect(latex).toContain("\\ensuremath{\\alpha}");
    expect(latex).toContain("\\text{[U+65E5]}");
    expect(latex).toContain("{[\\mathrm{50\\% \\$\\#\\&}]} &= 2 \\quad \\text{(held constant)}");
    expect(latex).toContain("\\xrightarrow{10^{-7}} \\emptyset");
    expect(latex).toContain("v = \\mathrm{Vmax}\\cdot\\mathrm{Km}\\cdot k\\cdot S");
    expectBalanced(latex);
  });

  it("stays balanced and ASCII whatever the names", async () => {
    const specials = fc.constantFrom(..."\\{}$&#^_%~<>|'`@*[]-+=/.,:aZ0 \t".split(""));
    const name = fc
      .oneof(fc.string({ unit: "grapheme", minLength: 1, maxLength: 8 }), fc.string({ unit: specials, minLength: 1, maxLength: 8 }))
      .filter((text) => !/["\n]/.test(text) && text.trim() !== "");
    await fc.assert(
      fc.asyncProperty(fc.uniqueArray(name, { minLength: 2, maxLength: 4 }), fc.string({ unit: "grapheme", maxLength: 20 }), async (names, title) => {
        const quoted = names.map((each) => `"${each}"`);
        const source = `${quoted[0]} + ${quoted[1]} <=> 2 ${quoted.at(-1)} @ 1, 2\n${quoted[1]} -> 0 @ 3\n`;
        const parsed = parseMechanism(source);
        fc.pre(parsed.diagnostics.every((each) => each.severity !== "error"));
        const latex = exportLatex(parsed.mechanism, await analyzeSource(source), { title });
        expect(latex).toMatch(/^[\t\n\r\x20-\x7E]*$/);
        expectBalanced(latex);
      }),
      { numRuns: 100 },
    );
  });

  it("breaks a long right-hand side into rows between terms, with numbers as a × 10^n", async () => {
    const latex = await latexOf(readFileSync("tests/fixtures/oxidation-cell.weave", "utf8"));
    expect(latex).toContain("s62:}\\quad & Q + Q \\xrightarrow{1.2 \\times 10^{13}} \\mathrm{MQ}");
    expect(latex).toContain("k_{33} &= 3.15 \\times 10^{16}");
    const q = latex.slice(latex.indexOf("\\frac{d[\\mathrm{Q}]}{dt} &= "));
    const rows = q.slice(0, q.indexOf("\\frac{d[", 1)).split(" \\\\\n");
    expect(rows.length).toBeGreaterThan(1);
    expect(rows.slice(1, -1).every((row) => row.trimStart().startsWith("&\\quad {}"))).toBe(true);
    expect(q).toContain("{3 \\times 10^{9}}\\, [\\mathrm{M}][\\mathrm{MQ}]");
    expect(latex).not.toContain("\\allowbreak");
  });

  it.skipIf(!pdflatex)("keeps the equations of a 64-step mechanism inside the page", async () => {
    const folder = mkdtempSync(join(tmpdir(), "mechweave-latex-"));
    try {
      writeFileSync(join(folder, "cell.tex"), await latexOf(readFileSync("tests/fixtures/oxidation-cell.weave", "utf8"), "Flow cell"));
      execFileSync(pdflatex!, ["-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", `-output-directory=${folder}`, join(folder, "cell.tex")], {
        cwd: folder,
        timeout: 60_000,
        stdio: "pipe",
      });
      // TeX reports every line wider than the text as an overfull box.
      expect(readFileSync(join(folder, "cell.log"), "latin1")).not.toMatch(/Overfull \\hbox/);
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });

  it.skipIf(!pdflatex)("compiles with pdflatex", async () => {
    const folder = mkdtempSync(join(tmpdir(), "mechweave-latex-"));
    try {
      const controls = '"a\u0001b\u007f" + "\u0301x\u200b" -> "\ud83e\uddea\u00a0\u2212" @ 1\n';
      const documents = [await latexOf(awkward, "Awkward & 100% {odd}"), await latexOf(controls, "Controls \u0007 and emoji \ud83e\uddea"), ...(await Promise.all(demoMechanisms.map((demo) => latexOf(demo.source, demo.title))))];
      documents.forEach((latex, index) => {
        const file = join(folder, `mechanism-${index}.tex`);
        writeFileSync(file, latex);
        execFileSync(pdflatex!, ["-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", `-output-directory=${folder}`, file], {
          cwd: folder,
          timeout: 60_000,
          stdio: "pipe",
        });
        expect(existsSync(join(folder, `mechanism-${index}.pdf`))).toBe(true);
      });
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
