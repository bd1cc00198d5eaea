// The kinds of node of the species–step view: a species as a plain box, a step as a small square
// with its label beside it, so the species stand out and the steps stay out of the way, and a hub
// species' copy beside one step as a smaller box with a dashed rim, so it reads as "again".
import type { Node, NodeProps } from "@xyflow/react";
import { litHalo } from "./complex-node";

export type SpeciesStepData = {
  label: string;
  description: string;
  dim?: boolean;
  lit?: boolean;
};

export type SpeciesNode = Node<SpeciesStepData, "species">;
export type StepNode = Node<SpeciesStepData, "step">;
export type CopyNode = Node<SpeciesStepData, "copy">;

/** A species' pill; a copy's is smaller, dashed and fainter. */
function SpeciesPill({ data, selected, copy }: { data: SpeciesStepData; selected: boolean; copy: boolean }) {
  const shape = copy
    ? "border border-dashed border-ink/50 px-[7px] text-[11px] leading-[18px] text-ink/80"
    : "border-[1.5px] border-ink/60 px-3 text-[13.5px] leading-[31px] text-ink";
  return (
    <div
      className={`rounded-full bg-raised font-mono whitespace-nowrap ${shape}`}
      style={{ opacity: data.dim ? 0.25 : 1, boxShadow: selected ? `0 0 0 ${copy ? 3 : 4}px color-mix(in oklab, var(--mw-accent) 40%, transparent)` : data.lit ? litHalo : undefined }}
      title={data.description}
      data-copy={copy || undefined}
      data-lit={data.lit || undefined}
      data-dim={data.dim || undefined}
    >
      {data.label}
    </div>
  );
}

export function SpeciesNodeView({ data, selected }: NodeProps<SpeciesNode>) {
  return <SpeciesPill data={data} selected={selected} copy={false} />;
}

export function CopyNodeView({ data, selected }: NodeProps<CopyNode>) {
  return <SpeciesPill data={data} selected={selected} copy />;
}

export function StepNodeView({ data, selected }: NodeProps<StepNode>) {
  const colour = selected ? "var(--mw-accent)" : data.lit ? "var(--mw-signal)" : "var(--mw-muted)";
  return (
    <div className="relative h-3.5 w-3.5 rounded-[3px]" style={{ background: colour, opacity: data.dim ? 0.2 : 1 }} title={data.description} data-lit={data.lit || undefined} data-dim={data.dim || undefined}>
      <span className="absolute top-1/2 left-[18px] -translate-y-1/2 font-mono text-[11px] leading-none whitespace-nowrap" style={{ color: data.lit ? "var(--mw-signal)" : "var(--mw-muted)" }}>
        {data.label}
      </span>
    </div>
  );
}
