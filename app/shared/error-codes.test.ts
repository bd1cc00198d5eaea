import { describe, expect, it } from "vitest";
import { IntegrationFailure, SimulationCancelled, SimulationInputError } from "~/chem/kinetics/errors";
import { RealizeRequestError } from "~/chem/realize/request-error";
import { QueueFullError } from "../../server/sim/admission";
import { SimulationLimitError } from "../../server/sim/job";
import { jobFailure } from "~/utils/dynamics.server";
import { httpError, methodNotAllowed } from "~/utils/http";
import { codeOf, errorCodes, isErrorCode, statusOf } from "./error-codes";

describe("the code → status table", () => {
  it("answers every status the API page documents, and only those plus 499", () => {
    const statuses = new Set(Object.values(errorCodes).map(({ status }) => status));
    expect([...statuses].sort()).toEqual([400, 401, 403, 404, 405, 413, 415, 422, 429, 499, 503]);
  });

  it("gives each error class a code in the table, whatever side of the worker it was built on", () => {
    const cases: [Error, string, number][] = [
      [new SimulationInputError("the end time must be a positive number"), "bad_input", 400],
      [new RealizeRequestError("no variable q"), "bad_input", 400],
      [new IntegrationFailure("step size underflow"), "integration_failed", 422],
      [new SimulationCancelled(), "cancelled", 499],
      [new QueueFullError("3 jobs waiting", 10), "busy", 429],
      [new SimulationLimitError("at most 200 sweep points", "size"), "too_large", 413],
      [new SimulationLimitError("the run needed more than 512 MB", "memory"), "too_large", 413],
      [new SimulationLimitError("the run took longer than 60 s", "time"), "time_limit", 503],
    ];
    for (const [error, code, status] of cases) {
      expect(codeOf(error)).toBe(code);
      expect(statusOf(codeOf(error)!)).toBe(status);
    }
  });

  it("reads no code from an unexpected error, even one with a system error's own code", () => {
    expect(codeOf(new Error("boom"))).toBeNull();
    expect(codeOf(Object.assign(new Error("gone"), { code: "ENOENT" }))).toBeNull();
    expect(codeOf({ code: "bad_input" })).toBeNull();
    expect(isErrorCode("toString")).toBe(false);
  });
});

describe("error responses", () => {
  it("carry { error, code } with the table's status", async () => {
    const response = httpError("not_found", "No mechanism with that id is visible to you.");
    expect(response.status).toBe(404);
    expect(await response.json()).toEqual({ error: "No mechanism with that id is visible to you.", code: "not_found" });
  });

  it("405 names the allowed methods", async () => {
    const response = methodNotAllowed(["GET", "POST"]);
    expect(response.status).toBe(405);
    expect(response.headers.get("Allow")).toBe("GET, POST");
    expect(await response.json()).toEqual({ error: "Use GET or POST.", code: "method_not_allowed" });
  });

  it("a job's failure reads as a sentence and keeps Retry-After", () => {
    expect(jobFailure(new QueueFullError("you have 3 jobs waiting", 12))).toEqual({ code: "busy", message: "You have 3 jobs waiting.", retryAfter: 12 });
    expect(jobFailure(new Error("a bug"))).toBeNull();
  });
});
