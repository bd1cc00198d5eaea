// The mechanism's data sets and fits, read over HTTP and read again whenever the room's `fits`
// map changes: a fit a co-author starts or finishes (on any instance) appears without a reload.
import { useCallback, useEffect, useState } from "react";
import type * as Y from "yjs";
import type { FitResult } from "~/chem/fit/types";
import { fitsMap } from "~/shared/room-document";

export interface DataSetEntry {
  id: string;
  name: string;
  bytes: number;
  uploadedBy: string | null;
  createdAt: string;
}

export interface StoredFitSettings {
  vary: string[];
  bounds: Record<string, { low?: number; high?: number }>;
  dataSets: { id: string | null; name: string }[];
}

export interface FitEntry {
  id: string;
  snapshotId: number | null;
  ranBy: string | null;
  status: "running" | "done" | "failed";
  settings: StoredFitSettings;
  result: (FitResult & { dataWarnings?: string[] }) | null;
  error: string | null;
  createdAt: string;
  finishedAt: string | null;
}

export function useFits(mechanismId: string, doc: Y.Doc | null) {
  const [dataSets, setDataSets] = useState<DataSetEntry[]>([]);
  const [fits, setFits] = useState<FitEntry[]>([]);
  const [error, setError] = useState<string | null>(null);
  const base = `/api/v1/mechanisms/${mechanismId}`;

  const reload = useCallback(async () => {
    try {
      const [sets, runs] = await Promise.all([fetch(`${base}/data-sets`), fetch(`${base}/fits`)]);
      if (!sets.ok || !runs.ok) throw new Error(`The server answered ${sets.ok ? runs.status : sets.status}.`);
      setDataSets(((await sets.json()) as { dataSets: DataSetEntry[] }).dataSets);
      setFits(((await runs.json()) as { fits: FitEntry[] }).fits);
      setError(null);
    } catch (failure) {
      setError(`The data sets and fits could not be read: ${(failure as Error).message}`);
    }
  }, [base]);

  useEffect(() => void reload(), [reload]);

  useEffect(() => {
    if (!doc) return;
    const notices = fitsMap(doc);
    const changed = () => void reload();
    notices.observe(changed);
    return () => notices.unobserve(changed);
  }, [doc, reload]);

  return { dataSets, fits, error, reload };
}
