// What the completion source offers where the cursor is, read from the syntax tree around it.
import { CompletionContext } from "@codemirror/autocomplete";
import { ensureSyntaxTree, syntaxTree } from "@codemirror/language";
import { EditorState, type TransactionSpec } from "@codemirror/state";
import type { EditorView } from "@codemirror/view";
import { describe, expect, it } from "vitest";
import { completeMechanismNames } from "./complete";
import { mechanism } from "./mechanism-language";

const text = 'X + "Fe3+" -> 2Y @ k1\nk1 = 1\n';

async function completionAt(doc: string, pos: number) {
  const created = EditorState.create({ doc, selection: { anchor: pos }, extensions: [mechanism()] });
  // A new state parses for 20 ms and keeps whatever tree it has by then: on a busy machine a part
  // of the text, where the cursor's node is missing. ensureSyntaxTree finishes the parse (however
  // long it takes) in the state's parse context, and a transaction hands the whole tree to
  // `syntaxTree`, which the completion reads.
  if (!ensureSyntaxTree(created, created.doc.length, Infinity)) throw new Error("the text was not parsed");
  const state = created.update({}).state;
  expect(syntaxTree(state).length).toBe(doc.length);
  return { state, result: await completeMechanismNames(new CompletionContext(state, pos, true)) };
}

/** Completion labels offered at the `|` in the text. */
async function labelsAt(marked: string): Promise<string[]> {
  const { result } = await completionAt(marked.replace("|", ""), marked.indexOf("|"));
  return (result?.options ?? []).map((option) => option.label);
}

describe("completion by position", () => {
  it("offers species inside a complex, quoted as they must be written", async () => {
    expect(await labelsAt(text + "Y -> |")).toEqual(["X", '"Fe3+"', "Y"]);
  });

  it("offers rate coefficient names after @", async () => {
    expect(await labelsAt(text + "Y -> X @ |")).toEqual(["k1"]);
  });

  it("offers both inside a custom rate law", async () => {
    expect(await labelsAt(text + "Y -> X @ { |}")).toEqual(["X", '"Fe3+"', "Y", "k1"]);
  });

  it("does not offer the half-typed word as a name of its own", async () => {
    expect(await labelsAt(text + "Y -> Zq|")).not.toContain("Zq");
  });

  it("replaces the closing quote typed ahead when a quoted name is picked", async () => {
    const doc = text + 'Y -> "Fe"';
    const pos = doc.length - 1;
    const { state, result } = await completionAt(doc, pos);
    const option = result!.options.find((candidate) => candidate.label === '"Fe3+"')!;
    // The apply function only reads the state and dispatches, so a stand-in view will do without a DOM.
    const view = { state, dispatch: (spec: TransactionSpec) => (view.state = view.state.update(spec).state) };
    if (typeof option.apply !== "function") throw new Error("a quoted name applies itself");
    option.apply(view as unknown as EditorView, option, result!.from, pos);
    expect(view.state.doc.toString()).toBe(text + 'Y -> "Fe3+"');
  });
});
