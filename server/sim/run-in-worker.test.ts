import { describe, expect, it } from "vitest";
import { SimulationCancelled, SimulationInputError } from "~/chem/kinetics/errors";
import { lorenz, robertson } from "../../tests/fixtures/dynamics/models";
import { runJob, type DynamicsJob } from "./job";
import { WorkerBudget } from "../worker-budget";
import { SimulationLimitError, WorkerJobs } from "./run-in-worker";

const { run: runInWorker } = new WorkerJobs(new WorkerBudget());

const longLyapunov: DynamicsJob = { kind: "lyapunov", model: { kind: "ode", ode: lorenz() }, options: { until: 1e7 } };

describe("dynamics in a worker thread", { timeout: 60_000 }, () => {
  it("returns what an in-process run returns, with progress, while the event loop stays free", async () => {
    const job: DynamicsJob = { kind: "simulate", model: { kind: "mechanism", ...robertson() }, settings: { until: 1e5, samples: 400 } };
    const progress: number[] = [];
    let ticks = 0;
    const ticker = setInterval(() => ticks++, 5);
    const result = await runInWorker(job, { onProgress: (f) => progress.push(f) });
    clearInterval(ticker);
    const local = runJob(job);
    expect(result.series).toEqual(local.series);
    expect(result.stats.steps).toBe(local.stats.steps);
    expect(progress.length).toBeGreaterThan(10);
    expect(progress.at(-1)).toBe(1);
    expect(ticks).toBeGreaterThan(0);
  });

  it("stops a running job when its signal aborts", async () => {
    const controller = new AbortController();
    let abortedAt = 0;
    const job: DynamicsJob = { kind: "simulate", model: { kind: "ode", ode: lorenz() }, settings: { until: 1e5, samples: 1000, rtol: 1e-10 } };
    const onProgress = () => {
      abortedAt ||= Date.now();
      controller.abort();
    };
    await expect(runInWorker(job, { signal: controller.signal, onProgress })).rejects.toBeInstanceOf(SimulationCancelled);
    expect(abortedAt).toBeGreaterThan(0);
    expect(Date.now() - abortedAt).toBeLessThan(1_000);
  });

  it("stops a run over its time limit and refuses models over the size limit", async () => {
    await expect(runInWorker(longLyapunov, { limits: { timeMs: 300 } })).rejects.toThrow(/longer than 0.3 s/);
    const job: DynamicsJob = { kind: "simulate", model: { kind: "mechanism", ...robertson() }, settings: { until: 1, samples: 2 } };
    await expect(runInWorker(job, { limits: { maxVariables: 2 } })).rejects.toBeInstanceOf(SimulationLimitError);
  });

  it("passes input errors back as their own class", async () => {
    const { mechanism, network } = robertson();
    network.reactions[0].rate = null;
    const job: DynamicsJob = { kind: "simulate", model: { kind: "mechanism", mechanism, network }, settings: { until: 1, samples: 2 } };
    await expect(runInWorker(job)).rejects.toBeInstanceOf(SimulationInputError);
  });
});
