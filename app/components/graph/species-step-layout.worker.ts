// Lays out the species–step view off the main thread: at 500 steps the force simulation runs for
// seconds on a busy machine, and typing must not wait for it.
import { layoutSpeciesSteps, type SpeciesStepModel } from "./species-step-model";

self.onmessage = (event: MessageEvent<{ id: number; model: SpeciesStepModel }>) => {
  const { id, model } = event.data;
  self.postMessage({ id, positions: layoutSpeciesSteps(model) });
};
