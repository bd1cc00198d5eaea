// A job's error as plain data, and back: errors cross from a worker thread (structured clone) and
// from a worker process (the queue's JSON) by name, so the receiving side rebuilds the class the
// routes tell apart by its `code`.
import { IntegrationFailure, SimulationCancelled, SimulationInputError } from "~/chem/kinetics/errors";
import { RealizeRequestError } from "~/chem/realize/request-error";
import { SimulationLimitError } from "./job";

export interface ErrorRecord {
  name: string;
  message: string;
  /** What a SimulationLimitError's limit was: size, time or memory. */
  limit?: string;
}

const rebuilt: Record<string, new (message: string) => Error> = {
  SimulationInputError,
  IntegrationFailure,
  RealizeRequestError,
  SimulationCancelled,
};

export function errorRecord(error: unknown): ErrorRecord {
  const { name, message } = error instanceof Error ? error : new Error(String(error));
  const limit = (error as { limit?: unknown }).limit;
  return typeof limit === "string" ? { name, message, limit } : { name, message };
}

export function rebuildError({ name, message, limit }: ErrorRecord): Error {
  if (name === "SimulationLimitError") return new SimulationLimitError(message, (limit ?? "size") as SimulationLimitError["limit"]);
  return new (rebuilt[name] ?? Error)(message);
}
