// Reads a chemical formula — `CH4`, `Ca(OH)2`, `"Fe3+"`, `"MnO4-"`, `"SO4^2-"` — into atom counts
// and a charge, for the element balance of steps. Hydrates (`CuSO4·5H2O`) are out of scope.

/** Every element symbol of the periodic table, 1 to 118. */
const ELEMENTS = new Set(
  (
    "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn Ga Ge As Se Br Kr " +
    "Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er Tm Yb " +
    "Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn Fr Ra Ac Th Pa U Np Pu Am Cm Bk Cf Es Fm Md No Lr Rf " +
    "Db Sg Bh Hs Mt Ds Rg Cn Nh Fl Mc Lv Ts Og"
  ).split(" "),
);

export interface Formula {
  /** Atoms of each element, in order of first appearance; no zero counts. */
  atoms: Record<string, number>;
  charge: number;
}

export type FormulaReading = { ok: true; formula: Formula } | { ok: false; problem: string };

/** The electron of a half-reaction: no atoms, one negative charge. */
const ELECTRON = "e-";

/**
 * Reads a formula. A charge is a trailing sign: `OH-`, `NH4+`, `Fe++`. Digits just before the sign
 * are the charge when the rest is one bare element (`Fe3+`, `O2-`: monatomic ions) and an atom count
 * otherwise (`MnO4-`, `H3O+`); `^` or a space puts the charge apart explicitly: `SO4^2-`, `C2O4 2-`,
 * `O2^-` (superoxide).
 */
export function readFormula(text: string): FormulaReading {
  const written = text.trim();
  if (written === ELECTRON) return { ok: true, formula: { atoms: {}, charge: -1 } };
  const split = splitCharge(written);
  if (!split.ok) return split;
  const atoms: Record<string, number> = {};
  const problem = new AtomReader(split.body, atoms).read();
  if (problem) return { ok: false, problem };
  return { ok: true, formula: { atoms, charge: split.charge } };
}

type ChargeSplit = { ok: true; body: string; charge: number } | { ok: false; problem: string };

function splitCharge(written: string): ChargeSplit {
  const apart = /^(.*?)(?:\^|\s+)(\d*)([+-])$/.exec(written) ?? /^(.*?)(?:\^|\s+)([+-])(\d+)$/.exec(written)?.slice(0, 4);
  if (apart) {
    const [, body, first, second] = apart;
    const [digits, sign] = /\d/.test(first) || first === "" ? [first, second] : [second, first];
    return { ok: true, body, charge: signed(sign, digits === "" ? 1 : Number(digits)) };
  }
  const signs = /^(.*?)([+-]+)$/.exec(written);
  if (signs) {
    const [, before, run] = signs;
    if (/[+-]/.test(before)) return { ok: false, problem: `"${written}" has a sign inside it; a charge goes at the end, as in "SO4^2-".` };
    if (!run.split("").every((char) => char === run[0])) return { ok: false, problem: `"${written}" ends in mixed signs.` };
    const monatomic = /^([A-Z][a-z]?)(\d+)$/.exec(before);
    if (monatomic && run.length === 1) return { ok: true, body: monatomic[1], charge: signed(run, Number(monatomic[2])) };
    return { ok: true, body: before, charge: signed(run[0], run.length) };
  }
  const trailing = /^(.*?[A-Za-z)\]])([+-])(\d+)$/.exec(written);
  if (trailing) return { ok: true, body: trailing[1], charge: signed(trailing[2], Number(trailing[3])) };
  return { ok: true, body: written, charge: 0 };
}

function signed(sign: string, magnitude: number): number {
  return sign === "-" ? -magnitude : magnitude;
}

/** Element symbols with counts, and groups in ( ) or [ ] with a count after them. */
class AtomReader {
  private at = 0;

  constructor(
    private readonly text: string,
    private readonly into: Record<string, number>,
  ) {}

  /** A problem in words, or null when the whole text was read. */
  read(): string | null {
    if (this.text === "") return "a formula needs at least one element.";
    const problem = this.readGroup(1, null);
    if (problem) return problem;
    return this.at < this.text.length ? this.unexpected() : null;
  }

  private readGroup(multiplier: number, closing: string | null): string | null {
    const counts: Record<string, number> = {};
    let empty = true;
    while (this.at < this.text.length && this.text[this.at] !== closing) {
      const char = this.text[this.at];
      if (char === "(" || char === "[") {
        this.at++;
        const inner: Record<string, number> = {};
        const nested = new AtomReader(this.text, inner);
        nested.at = this.at;
        const problem = nested.readGroup(1, char === "(" ? ")" : "]");
        if (problem) return problem;
        this.at = nested.at + 1;
        const count = this.readCount();
        if (count === null) return this.badCount();
        for (const [element, n] of Object.entries(inner)) counts[element] = (counts[element] ?? 0) + n * count;
      } else if (/[A-Z]/.test(char)) {
        const element = this.readElement();
        if (!element) return `"${this.text.slice(this.at, this.at + 2).replace(/[^A-Za-z].*$/, "")}" is not an element symbol.`;
        const count = this.readCount();
        if (count === null) return this.badCount();
        counts[element] = (counts[element] ?? 0) + count;
      } else {
        return this.unexpected();
      }
      empty = false;
    }
    if (closing !== null && this.at >= this.text.length) return `"${closing === ")" ? "(" : "["}" is not closed.`;
    if (empty) return closing === null ? "a formula needs at least one element." : "empty parentheses.";
    for (const [element, n] of Object.entries(counts)) this.into[element] = (this.into[element] ?? 0) + n * multiplier;
    return null;
  }

  /** A one- or two-letter symbol; the two-letter one when both exist (`Co` is cobalt, `CO` two elements). */
  private readElement(): string | null {
    const two = this.text.slice(this.at, this.at + 2);
    if (/^[A-Z][a-z]$/.test(two)) {
      if (!ELEMENTS.has(two)) return null;
      this.at += 2;
      return two;
    }
    const one = this.text[this.at];
    if (!ELEMENTS.has(one)) return null;
    this.at += 1;
    return one;
  }

  /** The count after a symbol or group: 1 when absent, null when 0. */
  private readCount(): number | null {
    const digits = /^\d*/.exec(this.text.slice(this.at))![0];
    this.at += digits.length;
    if (digits === "") return 1;
    const count = Number(digits);
    return count > 0 && Number.isSafeInteger(count) ? count : null;
  }

  private badCount(): string {
    return "an atom count is a whole number from 1 up.";
  }

  private unexpected(): string {
    return `"${this.text[this.at]}" cannot stand at this place in a formula.`;
  }
}
