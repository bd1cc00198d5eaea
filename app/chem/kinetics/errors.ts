// Errors a caller must tell apart: the model or settings are unusable (the author fixes them), the
// integration failed on a valid model, or somebody cancelled the run.

/** The mechanism, ODE or settings cannot be simulated as given (a missing rate coefficient, …). */
export class SimulationInputError extends Error {
  override name = "SimulationInputError";
}

/** The integrator gave up (step size underflow, step limit, non-finite values). */
export class IntegrationFailure extends Error {
  override name = "IntegrationFailure";
}

export class SimulationCancelled extends Error {
  override name = "SimulationCancelled";
  constructor() {
    super("the simulation was cancelled");
  }
}
