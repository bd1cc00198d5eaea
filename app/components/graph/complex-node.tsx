// One complex as a box: tinted by its linkage class, with a double rim when it belongs to a
// terminal strong linkage class.
import { Handle, type Node, type NodeProps, Position } from "@xyflow/react";
import type { ClassColours } from "./linkage-colours";

export type ComplexNodeData = {
  label: string;
  colours: ClassColours;
  terminal: boolean;
  description: string;
};

export type ComplexNode = Node<ComplexNodeData, "complex">;

// Arrows are drawn centre to centre (see edge-geometry), so handles exist only because React Flow
// attaches edges to them; they stay invisible and cannot start a connection.
const hiddenHandle = { opacity: 0, pointerEvents: "none", width: 1, height: 1, minWidth: 0, minHeight: 0, border: 0 } as const;

const plainRim = 1.5;
const terminalRim = 4;

export function ComplexNodeView({ data, selected }: NodeProps<ComplexNode>) {
  const rim = data.terminal ? terminalRim : plainRim;
  // The double rim eats into the padding, so both kinds of box are the same size and neighbours
  // laid out in one row stay centred on one line.
  const inset = rim - plainRim;
  return (
    <div
      className="rounded-lg font-mono text-[13.5px] leading-6 whitespace-nowrap text-ink"
      style={{
        background: data.colours.fill,
        borderColor: data.colours.outline,
        borderStyle: data.terminal ? "double" : "solid",
        borderWidth: rim,
        padding: `${6 - inset}px ${14 - inset}px`,
        // A soft halo, not a second line: a crisp ring would read as the terminal double rim.
        boxShadow: selected ? "0 0 0 4px color-mix(in oklab, var(--mw-accent) 40%, transparent)" : undefined,
      }}
      title={data.description}
    >
      <Handle type="target" position={Position.Left} isConnectable={false} style={hiddenHandle} />
      {data.label}
      <Handle type="source" position={Position.Right} isConnectable={false} style={hiddenHandle} />
    </div>
  );
}
