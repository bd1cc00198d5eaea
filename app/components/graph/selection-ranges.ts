// The text behind a graph element: the steps a reaction came from (several when duplicates were
// merged), or every step a complex takes part in. Read with the shared parser and network code,
// so complex and reaction indices are the ones the server's report uses.
import { buildNetwork } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";
import type { GraphSelection } from "./complex-graph";

export function selectionRanges(source: string, selection: GraphSelection): { from: number; to: number }[] {
  const { mechanism } = parseMechanism(source);
  const { reactions } = buildNetwork(mechanism);
  const chosen =
    selection.kind === "reaction"
      ? reactions.slice(selection.index, selection.index + 1)
      : reactions.filter(({ from, to }) => from === selection.index || to === selection.index);
  const steps = [...new Set(chosen.flatMap((reaction) => reaction.steps))].sort((a, b) => a - b);
  return steps.map((step) => ({ from: mechanism.steps[step].from, to: mechanism.steps[step].to }));
}
