// Which linkage classes this reader has folded: local to the reader (folding is a way of looking,
// not a change to the shared picture), starting from `startsFolded` when the first report arrives.
import { useCallback, useEffect, useMemo, useState } from "react";
import type { ComplexGraphReport } from "./graph-model";
import { classKey, startsFolded } from "./linkage-groups";

export interface LinkageFolding {
  /** Class indices of the current report that are folded. */
  folded: ReadonlySet<number>;
  fold(classIndices: Iterable<number>): void;
  unfold(classIndices: Iterable<number>): void;
  foldAll(): void;
  unfoldAll(): void;
}

export function useLinkageFolding(report: ComplexGraphReport | null): LinkageFolding {
  const [keys, setKeys] = useState<ReadonlySet<string> | null>(null);

  useEffect(() => {
    if (keys !== null || !report || report.complexes.length === 0) return;
    setKeys(new Set([...startsFolded(report)].map((index) => classKey(report, index))));
  }, [report, keys]);

  // Before the effect above has stored the starting keys, the first report is already drawn folded.
  const folded = useMemo(() => {
    if (!report) return new Set<number>();
    if (!keys) return startsFolded(report);
    return new Set(report.linkageClasses.flatMap((_, index) => (keys.has(classKey(report, index)) ? [index] : [])));
  }, [report, keys]);

  const change = useCallback(
    (classIndices: Iterable<number>, folding: boolean) => {
      if (!report) return;
      setKeys((current) => {
        const next = new Set(current ?? []);
        for (const index of classIndices) {
          const key = classKey(report, index);
          if (folding) next.add(key);
          else next.delete(key);
        }
        return next;
      });
    },
    [report],
  );
  const fold = useCallback((classIndices: Iterable<number>) => change(classIndices, true), [change]);
  const unfold = useCallback((classIndices: Iterable<number>) => change(classIndices, false), [change]);
  const all = useMemo(() => report?.linkageClasses.map((_, index) => index) ?? [], [report]);
  const foldAll = useCallback(() => fold(all), [fold, all]);
  const unfoldAll = useCallback(() => unfold(all), [unfold, all]);
  return { folded, fold, unfold, foldAll, unfoldAll };
}
