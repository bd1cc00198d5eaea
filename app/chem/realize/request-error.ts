// A realization request that cannot be carried out whatever the ODE says (a shift of an unknown
// variable, a mechanism with a custom rate law): the API answers 400, the CLI exits 2.
export class RealizeRequestError extends Error {
  override name = "RealizeRequestError";
  readonly code = "bad_input";
}
