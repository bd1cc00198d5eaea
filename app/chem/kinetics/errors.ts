// Errors a caller must tell apart: the model or settings are unusable (the author fixes them), the
// integration failed on a valid model, or somebody cancelled the run. Each carries the code the
// API answers it with (app/shared/error-codes.ts).

/** The mechanism, ODE or settings cannot be simulated as given (a missing rate coefficient, …). */
export class SimulationInputError extends Error {
  override name = "SimulationInputError";
  readonly code = "bad_input";
}

/** The integrator gave up (step size underflow, step limit, non-finite values). */
export class IntegrationFailure extends Error {
  override name = "IntegrationFailure";
  readonly code = "integration_failed";
}

export class SimulationCancelled extends Error {
  override name = "SimulationCancelled";
  readonly code = "cancelled";
  constructor() {
    super("the simulation was cancelled");
  }
}
