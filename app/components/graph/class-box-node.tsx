// A folded linkage class: one compact box in the class's tint naming the class and its size.
// Clicking it unfolds the class.
import type { Node, NodeProps } from "@xyflow/react";
import { litHalo } from "./complex-node";
import type { ClassColours } from "./linkage-colours";

export type ClassBoxData = {
  label: string;
  classIndex: number;
  colours: ClassColours;
  description: string;
  /** Outside the focused neighbourhood: drawn faint. */
  dim?: boolean;
  /** Holds the step under the caret or the focused item. */
  lit?: boolean;
};

export type ClassBoxNode = Node<ClassBoxData, "classBox">;

export function ClassBoxView({ data }: NodeProps<ClassBoxNode>) {
  return (
    <div
      className="cursor-pointer rounded-md px-3 font-sans text-[12.5px] leading-[30px] font-medium whitespace-nowrap text-ink"
      style={{
        background: data.colours.fill,
        border: `1.5px ${data.colours.rim} ${data.colours.outline}`,
        opacity: data.dim ? 0.25 : 1,
        boxShadow: data.lit ? litHalo : undefined,
      }}
      title={`${data.description}: click to unfold`}
      data-lit={data.lit || undefined}
      data-dim={data.dim || undefined}
      data-testid="class-box"
    >
      {data.label}
    </div>
  );
}
