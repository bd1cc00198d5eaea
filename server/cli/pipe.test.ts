// Every command's output must arrive whole through a pipe (`mechweave … --json | jq …`). Node
// writes to a pipe asynchronously, so a command that exits as soon as it has written would lose
// all but the pipe's first 64 KiB; each case here prints well over 1 MB into a real `|`.
import { execFile } from "node:child_process";
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const exec = promisify(execFile);
const MEGABYTE = 1024 * 1024;

let folder: string;

/** Runs `mechweave ARGS | cat` in a shell; the exit code is the command's, not cat's. */
async function throughPipe(...args: string[]) {
  const command = ["node", "--import", "tsx", "server/cli/main.ts", ...args].map((arg) => `'${arg}'`).join(" ");
  const { stdout, stderr } = await exec("bash", ["-c", `set -o pipefail; ${command} | cat; echo "exit $?" >&2`], {
    maxBuffer: 64 * MEGABYTE,
  });
  const code = Number(/exit (\d+)\n$/.exec(stderr)?.[1]);
  return { code, stdout, stderr };
}

const lines = (count: number, line: (i: number) => string) => Array.from({ length: count }, (_, i) => line(i)).join("\n") + "\n";

beforeAll(async () => {
  folder = await mkdtemp(join(tmpdir(), "mechweave-pipe-"));
  await writeFile(join(folder, "chain.weave"), lines(6000, (i) => `X${i} -> X${i + 1} @ 1`));
  await writeFile(join(folder, "negative.weave"), lines(12000, (i) => `A${i} -> B${i} @ -1`));
  await writeFile(join(folder, "unfinished.ode"), lines(20000, (i) => `x${i}' = -x${i} +`));
});

afterAll(() => rm(folder, { recursive: true, force: true }));

describe("mechweave output through a pipe", { timeout: 180_000 }, () => {
  it("analyze: the whole structure report of a long chain", async () => {
    const { code, stdout } = await throughPipe("analyze", join(folder, "chain.weave"), "--json");
    expect(stdout.length).toBeGreaterThan(MEGABYTE);
    expect(code).toBe(0);
    expect(JSON.parse(stdout).species).toHaveLength(6001);
  });

  it("simulate: every sample of a long time course", async () => {
    const { code, stdout } = await throughPipe("simulate", "tests/fixtures/dynamics/robertson.weave", "--until", "40", "--samples", "20000", "--json");
    expect(stdout.length).toBeGreaterThan(MEGABYTE);
    expect(code).toBe(0);
    expect(JSON.parse(stdout).t).toHaveLength(20000);
  });

  it("lyapunov: every diagnostic of a file with many errors, on stdout and stderr", async () => {
    const { code, stdout, stderr } = await throughPipe("lyapunov", join(folder, "negative.weave"), "--until", "1", "--json");
    expect(stdout.length).toBeGreaterThan(MEGABYTE);
    expect(stderr.length).toBeGreaterThan(MEGABYTE / 2);
    expect(code).toBe(1);
    expect(JSON.parse(stdout).diagnostics).toHaveLength(12000);
    expect(stderr).toMatch(/negative\.weave:12000:\d+: error: .*\nmechweave lyapunov: .* has errors\nexit 1\n$/);
  });

  it("realize: every diagnostic of an ODE file with many errors", async () => {
    const { code, stdout } = await throughPipe("realize", join(folder, "unfinished.ode"), "--json");
    expect(stdout.length).toBeGreaterThan(MEGABYTE);
    expect(code).toBe(1);
    expect(JSON.parse(stdout).diagnostics).toHaveLength(20000);
  });
});
