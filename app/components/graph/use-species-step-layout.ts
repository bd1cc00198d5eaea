// Positions of the species–step view, computed in a web worker so a 500-step layout never blocks
// typing; the newest model wins and an answer to an older one is dropped.
import { useEffect, useRef, useState } from "react";
import type { XY } from "./layout";
import type { SpeciesStepModel } from "./species-step-model";

export function useSpeciesStepLayout(model: SpeciesStepModel | null): Record<string, XY> | null {
  const [positions, setPositions] = useState<Record<string, XY> | null>(null);
  const worker = useRef<Worker | null>(null);
  const asked = useRef(0);

  useEffect(() => {
    const created = new Worker(new URL("./species-step-layout.worker.ts", import.meta.url), { type: "module" });
    created.onmessage = (event: MessageEvent<{ id: number; positions: Record<string, XY> }>) => {
      if (event.data.id === asked.current) setPositions(event.data.positions);
    };
    worker.current = created;
    return () => {
      created.terminate();
      worker.current = null;
    };
  }, []);

  useEffect(() => {
    if (!model || !worker.current) return;
    asked.current += 1;
    worker.current.postMessage({ id: asked.current, model });
  }, [model]);

  return positions;
}
