// Completion of the names a mechanism already uses: species where a complex or a declaration
// expects one, rate coefficient names after `@`, both inside a custom rate law.
import {
  type Completion,
  type CompletionContext,
  type CompletionResult,
  insertCompletionText,
  pickedCompletion,
} from "@codemirror/autocomplete";
import type { EditorView } from "@codemirror/view";
import { syntaxTree } from "@codemirror/language";
import type { SyntaxNode } from "@lezer/common";
import { parseMechanism } from "~/chem/parse";
import { speciesToken } from "~/chem/print";
import { readMechanismText } from "./text-reader";
import { type MechanismNames, namesOf } from "./text-reading";

export type { MechanismNames } from "./text-reading";
export type NameKind = "species" | "parameter" | "both";

/** Species, fixed species and parameter names (declared or only used), each once, in text order. */
export const mechanismNames = (source: string): MechanismNames => namesOf(parseMechanism(source));

export function completionOptions(names: MechanismNames, kind: NameKind): Completion[] {
  // Labels are written as the text would spell them, so typing an opening quote filters too.
  const species = (name: string, detail: string): Completion => {
    const label = speciesToken(name);
    return { label, type: "variable", detail, ...(label.startsWith('"') && { apply: replaceQuoted }) };
  };
  const options: Completion[] = [];
  if (kind !== "parameter") {
    options.push(...names.species.map((name) => species(name, "species")), ...names.fixed.map((name) => species(name, "fixed species")));
  }
  if (kind !== "species") options.push(...names.parameters.map((name) => ({ label: name, type: "constant", detail: "rate coefficient" })));
  return options;
}

/** A quoted name also takes the place of the closing quote the editor typed ahead of the cursor. */
function replaceQuoted(view: EditorView, completion: Completion, from: number, to: number): void {
  const end = view.state.sliceDoc(to, to + 1) === '"' ? to + 1 : to;
  view.dispatch({ ...insertCompletionText(view.state, completion.label, from, end), annotations: pickedCompletion.of(completion) });
}

/** Which names fit at a position, from the syntax node around it. */
function kindAt(context: CompletionContext): NameKind {
  for (let node: SyntaxNode | null = syntaxTree(context.state).resolveInner(context.pos, -1); node; node = node.parent) {
    if (node.name === "Law") return "both";
    if (node.name === "RatePart" || node.name === "Parameter") return "parameter";
    // A step reached without passing its rate part: the cursor is on one of its two complexes.
    if (node.name === "Complex" || node.name === "Step" || node.name === "Initial" || node.name === "Fixed") return "species";
  }
  return "both";
}

/** The names are read in the reading worker: a long text is not parsed on the page at each key. */
export async function completeMechanismNames(context: CompletionContext): Promise<CompletionResult | null> {
  const word = context.matchBefore(/"[^"\n]*|[A-Za-z][A-Za-z0-9_]*/);
  if (!word && !context.explicit) return null;
  const from = word?.from ?? context.pos;
  const to = word?.to ?? context.pos;
  // Read the text without the word being typed, so a half-written name is not offered to itself.
  const source = context.state.sliceDoc(0, from) + context.state.sliceDoc(to);
  const kind = kindAt(context);
  return {
    from,
    options: completionOptions(await readMechanismText("names", source), kind),
    validFor: /^("[^"\n]*|[A-Za-z0-9_]*)$/,
  };
}
