// Which stretches of the text stand behind a graph node or edge: the steps that produce the
// selected reaction, or every step touching the selected complex.
import type { TextRange } from "~/components/editor/collab-editor";
import type { GraphSelection } from "~/components/graph/complex-graph";
import { buildNetwork } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";

export function stepRangesFor(source: string, selection: GraphSelection | null): TextRange[] {
  if (!selection) return [];
  const { mechanism } = parseMechanism(source);
  const network = buildNetwork(mechanism);
  const reactions =
    selection.kind === "reaction"
      ? [network.reactions[selection.index]].filter(Boolean)
      : network.reactions.filter((r) => r.from === selection.index || r.to === selection.index);
  const steps = new Set(reactions.flatMap((r) => r.steps));
  return [...steps].sort((a, b) => a - b).map((i) => ({ from: mechanism.steps[i].from, to: mechanism.steps[i].to }));
}
