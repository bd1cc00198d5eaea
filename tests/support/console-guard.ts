// A console.error nobody expected fails the test that caused it: errors printed and passed over
// hide real faults (a swallowed rejection, a room that failed to flush). A test that provokes an
// error on purpose says so with `expectConsoleError(pattern)` first; that error must then happen.
// Loaded for every test file by vitest.config.ts (setupFiles). Server processes that tests start
// write to their own stderr and are not covered here.
import { format } from "node:util";
import { afterAll, afterEach } from "vitest";

interface Expected {
  pattern: RegExp;
  seen: boolean;
}

let expected: Expected[] = [];
let unexpected: string[] = [];

const printError = console.error.bind(console);

console.error = (...args: unknown[]) => {
  const text = format(...args);
  const match = expected.find((e) => e.pattern.test(text));
  if (match) {
    match.seen = true;
    return;
  }
  unexpected.push(text);
  printError(...args);
};

/** The running test will print an error matching `pattern` (and fails if it does not). */
export function expectConsoleError(pattern: RegExp): void {
  expected.push({ pattern, seen: false });
}

function verdict(where: string): Error | null {
  const problems = [
    ...unexpected.map((text) => `unexpected console.error ${where}:\n${text}`),
    ...expected.filter((e) => !e.seen).map((e) => `expected a console.error matching ${e.pattern} ${where}, none came`),
  ];
  expected = [];
  unexpected = [];
  return problems.length ? new Error(problems.join("\n\n")) : null;
}

// An error printed by a beforeAll hook is laid at the first test's door.
afterEach(() => {
  const problem = verdict("in this test");
  if (problem) throw problem;
});

afterAll(() => {
  const problem = verdict("after the file's last test (in an afterAll hook or a late callback)");
  if (problem) throw problem;
});
