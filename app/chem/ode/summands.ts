// Finds the top-level summands of a written expression (`x*(28 - z) - y` → `x*(28 - z)`, `- y`) so
// that an expanded term can be traced back to the text it came from.

export interface Span {
  from: number;
  to: number;
}

const OPERAND_END = /[A-Za-z0-9_.)\]']/;

export function splitSummands(text: string, span: Span): Span[] {
  const cuts = [span.from];
  let depth = 0;
  let previous = "";
  for (let i = span.from; i < span.to; i++) {
    const c = text[i];
    if (c === "(" || c === "[") depth++;
    else if (c === ")" || c === "]") depth--;
    else if (depth === 0 && (c === "+" || c === "-") && OPERAND_END.test(previous) && !isExponentSign(text, i)) {
      cuts.push(i);
    }
    if (!/\s/.test(c)) previous = c;
  }
  cuts.push(span.to);
  return cuts
    .slice(0, -1)
    .map((from, k) => trim(text, { from, to: cuts[k + 1] }))
    .filter((s) => s.to > s.from);
}

/** The sign in `1.5e-3`: an `e` directly after a number that is not part of a name. */
function isExponentSign(text: string, at: number): boolean {
  let i = at - 1;
  if (!/[eE]/.test(text[i] ?? "")) return false;
  i--;
  if (!/[0-9.]/.test(text[i] ?? "")) return false;
  while (i >= 0 && /[0-9.]/.test(text[i])) i--;
  return !/[A-Za-z_]/.test(text[i] ?? "");
}

function trim(text: string, span: Span): Span {
  let { from, to } = span;
  while (from < to && /\s/.test(text[from])) from++;
  while (to > from && /\s/.test(text[to - 1])) to--;
  return { from, to };
}
