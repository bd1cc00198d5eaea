import { describe, expect, it } from "vitest";
import { IntegrationFailure, SimulationCancelled, SimulationInputError } from "~/chem/kinetics/errors";
import { codeOf } from "~/shared/error-codes";
import { SimulationLimitError } from "./job";
import { errorRecord, rebuildError } from "./job-errors";

/** Through JSON, as an error crosses from a worker process in the queue's output column. */
const roundTrip = (error: Error) => rebuildError(JSON.parse(JSON.stringify(errorRecord(error))));

describe("job errors as records", () => {
  it("rebuilds the classes the routes answer by code, with their messages", () => {
    for (const error of [new SimulationInputError("Fix the mechanism first"), new IntegrationFailure("step size underflow"), new SimulationCancelled()]) {
      const rebuilt = roundTrip(error);
      expect(rebuilt).toBeInstanceOf(error.constructor);
      expect([rebuilt.message, codeOf(rebuilt)]).toEqual([error.message, codeOf(error)]);
    }
  });

  it("keeps which limit stopped a run", () => {
    const rebuilt = roundTrip(new SimulationLimitError("the run took longer than 60 s and was stopped", "time"));
    expect(rebuilt).toBeInstanceOf(SimulationLimitError);
    expect(codeOf(rebuilt)).toBe("time_limit");
    expect(codeOf(roundTrip(new SimulationLimitError("at most 100 sweep points", "size")))).toBe("too_large");
  });

  it("turns anything else into a plain error with its message, which the API answers as a server fault", () => {
    const rebuilt = roundTrip(new TypeError("x is undefined"));
    expect(rebuilt.constructor).toBe(Error);
    expect(codeOf(rebuilt)).toBeNull();
    expect(errorRecord("a thrown string")).toEqual({ name: "Error", message: "a thrown string" });
  });
});
