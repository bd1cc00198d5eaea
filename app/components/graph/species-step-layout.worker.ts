// Lays out the species–step view off the main thread: at 500 steps the force simulation runs for
// seconds on a busy machine, and typing must not wait for it.
import { layoutSpeciesSteps } from "./species-step-model";
import { answerLayoutRequests } from "./use-layout-worker";

answerLayoutRequests(layoutSpeciesSteps);
