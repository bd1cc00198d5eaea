// The server/browser boundary, checked from the source: a new leak fails here before it ships.
//
// - A module under app/ that is not `*.server.ts(x)` may not import from server/: route modules and
//   components reach server code only through `*.server.ts` modules, which the React Router bundler
//   refuses to put in a browser chunk. Statement-level `import type` / `export type` is allowed: it is
//   erased wholesale (verbatimModuleSyntax), so nothing of server/ reaches the bundle. An inline
//   `import { type X }` is not: it still compiles to an import of the module.
// - A module under server/ may import from app/ only app/shared, app/chem and app/utils/*.server.ts,
//   so the server never depends on UI code.
// - app/shared is the common ground of both sides, so it imports only app/shared and app/chem.
// Test files are exempt: no bundle ever contains them.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

interface Source {
  /** Repository-relative, forward slashes. */
  file: string;
  text: string;
}

interface ImportLine {
  specifier: string;
  typeOnly: boolean;
}

const root = path.resolve(import.meta.dirname, "../..");

/** Every import, re-export, side-effect import and dynamic import in a module. */
export function importsOf(text: string): ImportLine[] {
  const found: ImportLine[] = [];
  const fromClause = /^\s*(import|export)\s+(type\s+)?[^;"'`]*?\bfrom\s*["']([^"']+)["']/gm;
  for (const m of text.matchAll(fromClause)) found.push({ specifier: m[3], typeOnly: Boolean(m[2]) });
  for (const m of text.matchAll(/^\s*import\s*["']([^"']+)["']/gm)) found.push({ specifier: m[1], typeOnly: false });
  for (const m of text.matchAll(/\bimport\s*\(\s*["']([^"']+)["']\s*\)/g)) found.push({ specifier: m[1], typeOnly: false });
  return found;
}

/** The repository path an import points at, or null for a package. */
function target(file: string, specifier: string): string | null {
  if (specifier.startsWith("~/")) return `app/${specifier.slice(2)}`;
  if (specifier.startsWith(".")) return path.posix.normalize(path.posix.join(path.posix.dirname(file), specifier));
  return null;
}

const isServerModule = (file: string) => /\.server\.tsx?$/.test(file) || /\.server$/.test(file);
const within = (file: string, folder: string) => file.startsWith(`${folder}/`);

function problem(file: string, to: string, typeOnly: boolean): string | null {
  if (within(file, "app/shared")) {
    const foreign = within(to, "server") || (within(to, "app") && !within(to, "app/shared") && !within(to, "app/chem"));
    return foreign ? "app/shared may import only app/shared and app/chem" : null;
  }
  if (within(file, "app") && !isServerModule(file)) {
    return within(to, "server") && !typeOnly ? "reach server/ through an app/utils/*.server.ts module" : null;
  }
  if (within(file, "server") && within(to, "app")) {
    const allowed = within(to, "app/shared") || within(to, "app/chem") || (within(to, "app/utils") && isServerModule(to));
    return allowed ? null : "server/ may import from app/ only app/shared, app/chem and app/utils/*.server.ts";
  }
  return null;
}

export function boundaryViolations(sources: Source[]): string[] {
  const violations: string[] = [];
  for (const { file, text } of sources) {
    if (/\.test\.tsx?$/.test(file)) continue;
    for (const { specifier, typeOnly } of importsOf(text)) {
      const to = target(file, specifier);
      const why = to && problem(file, to, typeOnly);
      if (why) violations.push(`${file} imports "${specifier}": ${why}`);
    }
  }
  return violations;
}

function sourcesUnder(folder: string): Source[] {
  return fs
    .readdirSync(path.join(root, folder), { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile() && /\.tsx?$/.test(entry.name))
    .map((entry) => {
      const file = path.relative(root, path.join(entry.parentPath, entry.name)).split(path.sep).join("/");
      return { file, text: fs.readFileSync(path.join(root, file), "utf8") };
    });
}

/** The files that break the rules, one entry per offending import. */
const offenders = (sources: Source[]) => boundaryViolations(sources).map((violation) => violation.split(" ")[0]);

describe("server/browser boundary", () => {
  it("has no leaks in app/ or server/", () => {
    expect(boundaryViolations([...sourcesUnder("app"), ...sourcesUnder("server")])).toEqual([]);
  });

  it("finds every kind of import line", () => {
    const text = [
      'import { a } from "./a";',
      "import {\n  b,\n  c,\n} from '../b';",
      'import type { D } from "./d";',
      'export { e } from "./e";',
      'export * from "./f";',
      'import "./g";',
      'const h = await import("./h");',
      "const i = 1; // not an import",
    ].join("\n");
    expect(importsOf(text)).toEqual([
      { specifier: "./a", typeOnly: false },
      { specifier: "../b", typeOnly: false },
      { specifier: "./d", typeOnly: true },
      { specifier: "./e", typeOnly: false },
      { specifier: "./f", typeOnly: false },
      { specifier: "./g", typeOnly: false },
      { specifier: "./h", typeOnly: false },
    ]);
  });

  it("refuses server code in a browser module, and lets *.server.ts and type-only imports through", () => {
    expect(offenders([
      { file: "app/routes/members.tsx", text: 'import { listMembers } from "../../server/db/mechanisms";' },
      { file: "app/components/files-panel.tsx", text: 'import { atLeast, type Role } from "../../server/db/roles";' },
      { file: "app/components/lazy.tsx", text: 'const m = await import("../../server/db/mechanisms");' },
      { file: "app/utils/members.server.ts", text: 'export { listMembers } from "../../server/db/mechanisms";' },
      { file: "app/components/role-pill.tsx", text: 'import type { Role } from "../../server/db/roles";' },
      { file: "app/routes/tokens.tsx", text: 'import { listApiTokens } from "~/utils/accounts.server";' },
      { file: "app/chem/exchange/sbml.test.ts", text: 'import { demoMechanisms } from "../../../server/seed/demo";' },
    ])).toEqual(["app/routes/members.tsx", "app/components/files-panel.tsx", "app/components/lazy.tsx"]);
  });

  it("lets server/ import only app/shared, app/chem and app/utils/*.server.ts", () => {
    expect(offenders([
      { file: "server/collab/recompute.ts", text: 'import { roomAnalysisReader } from "../../app/utils/analysis-map";' },
      { file: "server/collab/room.ts", text: 'import type { RefusalReason } from "~/components/editor/text-limits";' },
      { file: "server/collab/room.ts", text: 'import { MAX_SOURCE_BYTES } from "../../app/shared/fields";' },
      { file: "server/sim/job.ts", text: 'import { parseMechanism } from "~/chem/parse";' },
      { file: "server/app.ts", text: 'import { publicOrigin } from "../app/utils/links.server";' },
      { file: "server/app.ts", text: 'import express from "express";' },
    ])).toEqual(["server/collab/recompute.ts", "server/collab/room.ts"]);
  });

  it("keeps app/shared free of UI and server code", () => {
    expect(offenders([
      { file: "app/shared/roles.ts", text: 'import { x } from "~/components/role-pill";' },
      { file: "app/shared/fields.ts", text: 'import { y } from "../../server/db/schema";' },
      { file: "app/shared/version-diff.ts", text: 'import type { AnalysisReport } from "~/chem/analysis";' },
    ])).toEqual(["app/shared/roles.ts", "app/shared/fields.ts"]);
  });
});
