// The key to the complex graph, in a strip under the canvas so it never covers a node: how linkage
// classes are told apart (tint, then rim pattern; every box names its class on hover), what a
// double rim means, and which species are held fixed (and so appear in no complex).
import { linkageClassColours } from "./linkage-colours";

const shownClasses = 8;

export function GraphLegend({ linkageClassCount, folded, fixedSpecies }: { linkageClassCount: number; folded: number; fixedSpecies: readonly string[] }) {
  const swatches = Array.from({ length: Math.min(linkageClassCount, shownClasses) }, (_, index) => linkageClassColours(index));
  return (
    <div
      className="flex flex-wrap items-center gap-x-5 gap-y-1 border-t border-line bg-surface px-3 py-1.5 text-xs text-muted"
      data-testid="graph-legend"
    >
      <div className="flex items-center gap-1">
        <span className="mr-1">
          {linkageClassCount} linkage {linkageClassCount === 1 ? "class" : "classes"}
        </span>
        {swatches.map((colours, index) => (
          <span
            key={index}
            className="inline-flex h-4 min-w-4 items-center justify-center rounded px-0.5 text-[10px] font-medium text-ink"
            style={{ background: colours.fill, border: `1.5px ${colours.rim} ${colours.outline}` }}
            title={`Linkage class ${index + 1}`}
          >
            {index + 1}
          </span>
        ))}
        {linkageClassCount > shownClasses && (
          <span title="Past ten tints the rim turns dashed, then dotted; hover a box for its class">
            … each box names its class{folded > 0 ? `; ${folded} folded` : ""}
          </span>
        )}
      </div>
      <div className="flex items-center gap-1.5">
        <span className="inline-block h-3.5 w-5 rounded-sm" style={{ border: "3.5px double var(--mw-muted)" }} />
        <span>terminal strong linkage class</span>
      </div>
      {fixedSpecies.length > 0 && (
        <div title="Held constant: their concentrations are folded into the rate coefficients">
          fixed <span className="font-mono text-ink">{fixedSpecies.join(", ")}</span> (not drawn in complexes)
        </div>
      )}
    </div>
  );
}
