// Where every complex of the graph is drawn: the shared positions, plus dagre's placements for
// complexes nobody has placed yet.
import { useEffect, useMemo, useState } from "react";
import type * as Y from "yjs";
import { complexLabel, type ComplexGraphReport } from "./graph-model";
import { estimateNodeSize, placeComplexes, type XY } from "./layout";
import { useSharedLayout } from "./use-shared-layout";

/**
 * An editor in a synced room writes its placements to the shared map for all to see; a viewer, or
 * anyone before sync, keeps them local, so nothing computed against an incomplete picture can
 * overwrite a co-author's layout.
 */
export function useComplexPositions(
  report: ComplexGraphReport | null,
  layout: Y.Map<unknown> | null,
  { canEdit, synced }: { canEdit: boolean; synced: boolean },
) {
  const shared = useSharedLayout(layout);
  const [local, setLocal] = useState<Record<string, XY>>({});
  const sharing = canEdit && synced;

  // Local placements made against an incomplete picture are dropped once the real one arrives.
  useEffect(() => setLocal({}), [synced, layout]);

  const known = useMemo(() => ({ ...local, ...shared.positions }), [local, shared.positions]);
  const placed = useMemo(() => {
    if (!report) return {};
    return placeComplexes({
      keys: report.complexes,
      reactions: report.reactions,
      linkageClasses: report.linkageClasses,
      known,
      sizeOf: (key) => estimateNodeSize(complexLabel(key)),
    });
  }, [report, known]);

  useEffect(() => {
    if (Object.keys(placed).length === 0) return;
    if (sharing) shared.write(placed);
    else setLocal((current) => ({ ...current, ...placed }));
  }, [placed, sharing, shared.write]);

  const all = useMemo(() => ({ ...known, ...placed }), [known, placed]);
  return { all, write: shared.write };
}
