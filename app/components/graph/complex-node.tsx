// One complex as a box: tinted by its linkage class (rim pattern too, once hues repeat), with a
// double rim when it belongs to a terminal strong linkage class, and a dashed ring with a name
// while a co-author drags it.
import type { Node, NodeProps } from "@xyflow/react";
import { useEffect, useRef } from "react";
import type { ClassColours } from "./linkage-colours";
import type { Holder } from "./use-held-complexes";

export type ComplexNodeData = {
  label: string;
  colours: ClassColours;
  terminal: boolean;
  description: string;
  /** New since the graph was first drawn: it glows once, so a room watching someone type sees what the text added. */
  appeared?: boolean;
  /** The co-author dragging this complex right now, if any. */
  heldBy?: Holder;
  /** Outside the focused neighbourhood: drawn faint. */
  dim?: boolean;
  /** Part of the step under the caret, or the focused item's neighbourhood. */
  lit?: boolean;
};

export type ComplexNode = Node<ComplexNodeData, "complex">;

const plainRim = 1.5;
/** The step under the caret and a focused neighbourhood glow in the signal colour, apart from selection's accent. */
export const litHalo = "0 0 0 4px color-mix(in oklab, var(--mw-signal) 55%, transparent)";
const terminalRim = 4;

export function ComplexNodeView({ data, selected }: NodeProps<ComplexNode>) {
  const box = useRef<HTMLDivElement>(null);
  const appeared = data.appeared;
  useEffect(() => {
    if (!appeared || matchMedia("(prefers-reduced-motion: reduce)").matches) return;
    box.current?.animate(
      [{ boxShadow: "0 0 0 10px color-mix(in oklab, var(--mw-signal) 45%, transparent)" }, { boxShadow: "0 0 0 0 transparent" }],
      { duration: 1600, easing: "ease-out" },
    );
  }, [appeared]);
  const rim = data.terminal ? terminalRim : plainRim;
  // The double rim eats into the padding, so both kinds of box are the same size and neighbours
  // laid out in one row stay centred on one line.
  const inset = rim - plainRim;
  return (
    <div
      ref={box}
      className="relative rounded-lg font-mono text-[13.5px] leading-6 whitespace-nowrap text-ink"
      style={{
        background: data.colours.fill,
        borderColor: data.colours.outline,
        borderStyle: data.terminal ? "double" : data.colours.rim,
        borderWidth: rim,
        padding: `${6 - inset}px ${14 - inset}px`,
        // A soft halo, not a second line: a crisp ring would read as the terminal double rim.
        boxShadow: selected ? "0 0 0 4px color-mix(in oklab, var(--mw-accent) 40%, transparent)" : data.lit ? litHalo : undefined,
        opacity: data.dim ? 0.25 : 1,
        outline: data.heldBy ? `2px dashed ${data.heldBy.colour}` : undefined,
        outlineOffset: 3,
      }}
      data-lit={data.lit || undefined}
      data-dim={data.dim || undefined}
      title={data.heldBy ? `${data.description}, moved by ${data.heldBy.name}` : data.description}
    >
      {data.heldBy && (
        <span
          className="absolute -top-6 left-0 rounded px-1.5 font-sans text-[11px] leading-4 font-medium whitespace-nowrap text-white"
          style={{ background: data.heldBy.colour }}
        >
          {data.heldBy.name}
        </span>
      )}
      {data.label}
    </div>
  );
}
