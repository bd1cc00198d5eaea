// Writing new values into a mechanism text where the author declared them: `k1 = 0.5` on a line of
// its own or inline in a step (`@ k1 = 0.5`), and `[A]0 = 1.0`. Only the number changes, so
// comments, layout and everything a co-author is typing elsewhere stay as they were.
import type { SyntaxNode } from "@lezer/common";
import { parser } from "../../grammar/parser";
import { initialSpecies } from "./fit/parameters";

export interface TextEdit {
  from: number;
  to: number;
  insert: string;
}

/** A value is written with six significant digits, in the grammar's number syntax (never a sign). */
export function valueText(value: number): string {
  return String(Number(value.toPrecision(6)));
}

export interface ValueEdits {
  /** In text order. */
  edits: TextEdit[];
  /** Parameters the text does not declare with a number: nothing should be written. */
  undeclared: string[];
  /** The values declared before (0 for an initial value the text did not give), to undo with. */
  previous: Record<string, number>;
}

/**
 * The edits that set each named value (`k1`, `[A]0`). A parameter the text does not declare is
 * named in `undeclared`; an initial value the text does not give gets a new line.
 */
export function declaredValueEdits(source: string, values: Record<string, number>): ValueEdits {
  const spans = declaredSpans(source);
  const edits: TextEdit[] = [];
  const undeclared: string[] = [];
  const added: string[] = [];
  const previous: Record<string, number> = {};
  for (const [name, value] of Object.entries(values)) {
    if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name}: a declared value must be a finite number ≥ 0`);
    const species = initialSpecies(name);
    const found = spans.get(species === null ? name : `[${species}]0`);
    if (found) {
      previous[name] = Number(source.slice(found[0].from, found[0].to));
      for (const span of found) edits.push({ ...span, insert: valueText(value) });
    } else if (species !== null) {
      previous[name] = 0;
      added.push(`${name} = ${valueText(value)}`);
    } else undeclared.push(name);
  }
  edits.sort((a, b) => a.from - b.from);
  if (added.length > 0) {
    const lead = source.length === 0 || source.endsWith("\n") ? "" : "\n";
    edits.push({ from: source.length, to: source.length, insert: `${lead}${added.join("\n")}\n` });
  }
  return { edits, undeclared, previous };
}

/** Applies edits given in text order to a string (for checks and previews; rooms apply them to the live text). */
export function applyEdits(source: string, edits: readonly TextEdit[]): string {
  let result = source;
  for (const edit of [...edits].reverse()) result = result.slice(0, edit.from) + edit.insert + result.slice(edit.to);
  return result;
}

/** Where each declared value's number (with its sign, if any) sits, by parameter name or `[X]0`. */
function declaredSpans(source: string): Map<string, { from: number; to: number }[]> {
  const spans = new Map<string, { from: number; to: number }[]>();
  const add = (name: string, span: { from: number; to: number }) => spans.set(name, [...(spans.get(name) ?? []), span]);
  const text = (node: SyntaxNode) => source.slice(node.from, node.to);
  parser.parse(source).iterate({
    enter(ref) {
      const node = ref.node;
      if (node.name === "Parameter" || node.name === "Rate") {
        const name = node.getChild("ParameterName");
        const value = valueSpan(source, node, name);
        if (name && value) add(text(name), value);
        return node.name === "Rate" ? false : undefined;
      }
      if (node.name === "Initial") {
        const species = node.getChild("Species");
        const value = valueSpan(source, node, node.getChild("InitialClose"));
        if (species && value) add(`[${speciesName(text(species))}]0`, value);
        return false;
      }
      return undefined;
    },
  });
  return spans;
}

/** The number declared right after `after` (`name = -?number`), sign included; null for anything else (`k * 2`, a broken line). */
function valueSpan(source: string, node: SyntaxNode, after: SyntaxNode | null): { from: number; to: number } | null {
  if (!after) return null;
  const number = node.getChild("Number", after.name);
  if (!number) return null;
  const between = /^\s*=\s*(-?)\s*$/.exec(source.slice(after.to, number.from));
  if (!between) return null;
  return { from: between[1] ? source.lastIndexOf("-", number.from) : number.from, to: number.to };
}

function speciesName(token: string): string {
  return token.startsWith('"') ? token.slice(1, token.endsWith('"') && token.length > 1 ? -1 : undefined) : token;
}
