// Part of the build: bundles the server, the job worker, the CLI and the two worker-thread entries
// into plain JavaScript in build/ (packages stay in node_modules), so starting any of them — and
// every worker thread they start — costs no TypeScript transform. The bundles sit directly in
// build/, one level below the project root as their sources in server/ are, so paths the code
// finds from its own place (the project root, the bundle beside it) stay right.
import { build } from "esbuild";
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");

export const bundles = {
  "mechweave-server": "server/main.ts",
  "mechweave-worker": "server/job-worker.ts",
  "mechweave-cli": "server/cli/main.ts",
  "job-thread": "server/sim/worker.ts",
  "analysis-thread": "server/collab/analysis-worker.ts",
};

/**
 * mathjs builds every one of its functions when it is imported (over a second on a cold process),
 * yet a mass-action text needs none of it: only custom rate laws, SBML and a few matrix functions
 * do. In the bundles `mathjs` is a module of wrappers that load it on first call, so a CLI command
 * or a worker thread pays for it only when its text needs it. The wrappers cover the names our
 * sources import; a wrapper called with `new` constructs (mathjs's node classes).
 */
const lazyMathjs = {
  name: "lazy-mathjs",
  setup(builder) {
    builder.onResolve({ filter: /^mathjs$/ }, (args) => (args.importer.includes("node_modules") ? undefined : { path: "mathjs", namespace: "lazy-mathjs" }));
    builder.onLoad({ filter: /.*/, namespace: "lazy-mathjs" }, () => ({ contents: lazyModule(mathjsNames()), loader: "js", resolveDir: root }));
  },
};

/** The value names our sources import from mathjs (types are erased and need no wrapper). */
function mathjsNames() {
  const names = new Set();
  const sources = ["app", "server"].flatMap((folder) =>
    readdirSync(path.join(root, folder), { recursive: true }).map((file) => path.join(folder, file)),
  );
  for (const file of sources.filter((name) => name.endsWith(".ts") || name.endsWith(".tsx"))) {
    for (const [, list] of readFileSync(path.join(root, file), "utf8").matchAll(/import\s*\{([^}]*)\}\s*from\s*"mathjs"/g)) {
      for (const item of list.split(",")) {
        const name = item.trim().split(/\s+as\s+/)[0];
        if (name && !name.startsWith("type ")) names.add(name);
      }
    }
  }
  return [...names].sort();
}

function lazyModule(names) {
  const wrappers = names.map(
    (name) => `export function ${name}(...args) { const value = load().${name}; return new.target ? new value(...args) : value(...args); }`,
  );
  return [
    'import { createRequire } from "node:module";',
    "const require = createRequire(import.meta.url);",
    "let mathjs;",
    'const load = () => (mathjs ??= require("mathjs"));',
    ...wrappers,
  ].join("\n");
}

await build({
  absWorkingDir: root,
  entryPoints: bundles,
  outdir: "build",
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  tsconfig: "tsconfig.json",
  sourcemap: "linked",
  logLevel: "warning",
  plugins: [lazyMathjs],
});
