// How this reader likes the species–step view drawn — hubs as copies, left out or drawn once, the
// degree from which a species counts as a hub, and whether a focus narrows the view to its
// neighbourhood — kept in the browser's storage: a way of looking, not a change to the mechanism.
import { useCallback, useState } from "react";
import { z } from "zod";
import { defaultHubChoice } from "./species-step-model";

export const speciesViewChoice = z.object({
  hubs: z.enum(["copies", "hidden", "once"]),
  threshold: z.number().int().min(2).max(10_000),
  focusOnly: z.boolean(),
});
export type SpeciesViewChoice = z.infer<typeof speciesViewChoice>;

export const defaultSpeciesViewChoice: SpeciesViewChoice = { hubs: defaultHubChoice.drawing, threshold: defaultHubChoice.threshold, focusOnly: false };
export const speciesViewStorageKey = "mechweave.species-step-view";

/** The stored choice, or the default when there is none or it no longer reads. */
export function readSpeciesViewChoice(stored: string | null): SpeciesViewChoice {
  if (!stored) return defaultSpeciesViewChoice;
  try {
    const read = speciesViewChoice.safeParse(JSON.parse(stored));
    return read.success ? read.data : defaultSpeciesViewChoice;
  } catch {
    return defaultSpeciesViewChoice;
  }
}

/** Only rendered in the browser (the graph mounts client-side), so storage is there to read. */
export function useSpeciesViewChoice(): [SpeciesViewChoice, (change: Partial<SpeciesViewChoice>) => void] {
  const [choice, setChoice] = useState(() => readSpeciesViewChoice(localStorage.getItem(speciesViewStorageKey)));
  const change = useCallback((update: Partial<SpeciesViewChoice>) => {
    setChoice((current) => {
      const read = speciesViewChoice.safeParse({ ...current, ...update });
      if (!read.success) return current;
      localStorage.setItem(speciesViewStorageKey, JSON.stringify(read.data));
      return read.data;
    });
  }, []);
  return [choice, change];
}
