// Where every complex of the graph is drawn: the shared positions, plus dagre's placements for
// complexes nobody has placed yet, computed in a web worker. A complex waiting for its place is
// not drawn yet; a report that brings no new complex asks for no placement at all.
import { useEffect, useMemo, useRef, useState } from "react";
import type * as Y from "yjs";
import type { ComplexGraphReport } from "./graph-model";
import type { PlacementInput, XY } from "./layout";
import { useLayoutWorker } from "./use-layout-worker";
import { useSharedLayout } from "./use-shared-layout";

type PlacementRequest = Omit<PlacementInput, "sizeOf">;

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
  const request = useMemo(() => {
    const missing = report?.complexes.filter((key) => !(key in known)) ?? [];
    if (!report || missing.length === 0) return null;
    const message: PlacementRequest = { keys: report.complexes, reactions: report.reactions, linkageClasses: report.linkageClasses, known };
    // The same complexes missing against the same placed ones get the same places.
    return { key: `${missing.join("\n")}\n${Object.keys(known).length}`, message };
  }, [report, known]);
  const placed = useLayoutWorker<PlacementRequest, Record<string, XY>>(
    () => new Worker(new URL("./complex-placement.worker.ts", import.meta.url), { type: "module" }),
    request,
  );

  // A placement answers the picture it was asked about: whatever a co-author placed meanwhile stays.
  const latestKnown = useRef(known);
  latestKnown.current = known;
  useEffect(() => {
    if (!placed) return;
    const fresh = Object.fromEntries(Object.entries(placed).filter(([key]) => !(key in latestKnown.current)));
    if (Object.keys(fresh).length === 0) return;
    if (sharing) shared.write(fresh);
    else setLocal((current) => ({ ...current, ...fresh }));
  }, [placed, sharing, shared.write]);

  return { all: known, write: shared.write };
}
