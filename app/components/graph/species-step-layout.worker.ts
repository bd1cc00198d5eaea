// Lays out the species–step view off the main thread: at 500 steps the force simulation runs for
// seconds on a busy machine, and typing must not wait for it. The answer names the way of drawing
// (hubs, focus) it was made for, so a picture drawn another way is not mixed into it.
import { layoutSpeciesSteps, type SpeciesStepModel } from "./species-step-model";
import { answerLayoutRequests } from "./use-layout-worker";

export interface SpeciesStepLayoutRequest {
  drawing: string;
  model: SpeciesStepModel;
}

answerLayoutRequests(({ drawing, model }: SpeciesStepLayoutRequest) => ({ drawing, positions: layoutSpeciesSteps(model) }));
