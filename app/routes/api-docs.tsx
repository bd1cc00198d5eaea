import { byteSize, MAX_CSV_BYTES, MAX_DATA_SETS_PER_MECHANISM, MAX_FIT_DATA_SETS, MAX_FIT_PARAMETERS, MAX_JSON_BODY_BYTES, MAX_ODE_BYTES, MAX_SBML_BYTES, MAX_SERVER_SAMPLES, MAX_SERVER_SWEEP_POINTS, MAX_SOURCE_BYTES } from "~/chem/limits";
import { errorCodes, type ErrorCode } from "~/shared/error-codes";
import type { Route } from "./+types/api-docs";

export const meta: Route.MetaFunction = () => [{ title: "JSON API · Mechweave" }];

export function loader({ request }: Route.LoaderArgs) {
  return { origin: new URL(request.url).origin };
}

interface Endpoint {
  method: string;
  path: string;
  role: string;
  what: string;
  example: (o: string) => string;
}

const auth = `-H "Authorization: Bearer $MECHWEAVE_TOKEN"`;
const json = `-H "Content-Type: application/json"`;

const endpoints: Endpoint[] = [
  { method: "GET", path: "/api/v1/mechanisms", role: "signed in", what: "The mechanisms you can see, with your role.", example: (o) => `curl ${auth} ${o}/api/v1/mechanisms` },
  { method: "POST", path: "/api/v1/mechanisms", role: "signed in", what: "Create a mechanism: { title, source? }.", example: (o) => `curl ${auth} ${json} -d '{"title":"Ozone draft","source":"O3 -> O2 + O @ k1 = 0.1"}' ${o}/api/v1/mechanisms` },
  { method: "GET", path: "/api/v1/mechanisms/:id", role: "viewer", what: "Title, summary, source, your role and the full structure analysis (with compatibilityClass: the dimension of the stoichiometric subspace and each conservation law's total at the initial state).", example: (o) => `curl ${auth} ${o}/api/v1/mechanisms/ID` },
  { method: "PUT", path: "/api/v1/mechanisms/:id/source", role: "editor", what: "Replace the text; applied through the live document, so everyone in the room sees it.", example: (o) => `curl -X PUT ${auth} ${json} -d '{"source":"A -> B @ 1"}' ${o}/api/v1/mechanisms/ID/source` },
  { method: "GET", path: "/api/v1/mechanisms/:id/snapshots", role: "viewer", what: "Versions, newest first.", example: (o) => `curl ${auth} ${o}/api/v1/mechanisms/ID/snapshots` },
  { method: "POST", path: "/api/v1/mechanisms/:id/snapshots", role: "editor", what: "Name the current version: { name }.", example: (o) => `curl ${auth} ${json} -d '{"name":"before review"}' ${o}/api/v1/mechanisms/ID/snapshots` },
  { method: "POST", path: "/api/v1/mechanisms/:id/simulations", role: "viewer", what: "Simulate: { until, samples, rtol?, atol?, method? } → { t, series, stats }. method is auto, stiff (RODAS4 or BDF by tolerance), explicit, bdf or rodas4; stats.method names the method that ran.", example: (o) => `curl ${auth} ${json} -d '{"until":50,"samples":101}' ${o}/api/v1/mechanisms/ID/simulations` },
  {
    method: "POST",
    path: "/api/v1/mechanisms/:id/dynamics",
    role: "viewer",
    what:
      "Run a dynamics job on a text: kind simulate, stochastic, equilibrium, lyapunov, sweep, continuation or witness, with optional overrides { parameters: { T: 1100 }, initial: { A: 2e-3 } } replacing values of the text. A sweep's target is { kind: \"parameter\", name }, { kind: \"initial\", species }, { kind: \"fixed\", species } (a held species), { kind: \"step\", label, direction? } or { kind: \"rate\", reaction }. Equilibrium options { settleTime?, start? }: Newton's method in the compatibility class of the initial state from several starts (start, the end of a settling run, the initial state, seeded random points), each root deflated so none is found twice → { converged, state, eigenvalues, stability, summary, … } for the first one found, equilibria: [{ state, residual, positive, eigenvalues, stability, summary, foundFrom }] for every distinct one, classDimension and starts. Stochastic settings { until, samples, volume, runs, seed, method?: \"direct\" | \"next-reaction\", maxEvents? }: that many exact runs on copy numbers n = round(c·volume), split over the job workers, the same for the same seed → { t, mean, variance, paths, stats } in copies. Continuation options { target (as a sweep's, but not a reaction by index), from, to, maxPoints? } → { points: [{ value, state, stable }], bifurcations: [{ kind: \"fold\" | \"hopf\", value, state, frequency? }], ended, summary }. Witness options { budgetMs } (1000 to 50000): the multistationarity witness search with that budget → { multistationarity: { verdict, reason, witness? }, reactions, species, conservationLaws, checks: [{ residual, totals }] } (one check per steady state of the witness: its largest |dX/dt| over the largest reaction rate, and each conservation law's total).",
    example: (o) =>
      `curl ${auth} ${json} -d '{"kind":"sweep","source":"A -> B @ 1e3*exp(-3000/T)\\nT = 300\\n[A]0 = 1","overrides":{"parameters":{"T":350}},"options":{"until":1,"samples":50,"target":{"kind":"parameter","name":"T"},"from":300,"to":600,"points":4,"scale":"linear","species":"A","observable":"final"}}' ${o}/api/v1/mechanisms/ID/dynamics`,
  },
  { method: "GET", path: "/api/v1/mechanisms/:id/data-sets", role: "viewer", what: "The stored data sets: { dataSets: [{ id, name, bytes, uploadedBy, createdAt }] }.", example: (o) => `curl ${auth} ${o}/api/v1/mechanisms/ID/data-sets` },
  { method: "POST", path: "/api/v1/mechanisms/:id/data-sets?name=NAME", role: "editor", what: `Store a data set: the CSV as the body (Content-Type: text/csv, at most ${byteSize(MAX_CSV_BYTES)}, ${MAX_DATA_SETS_PER_MECHANISM} a mechanism): a time column, one column per species, optional sd(X) columns, and comment lines such as # [A]0 = 0.002 or # T = 350 for what the experiment started from. A file that cannot be read is refused with its line and column.`, example: (o) => `curl ${auth} -H "Content-Type: text/csv" --data-binary @run1.csv "${o}/api/v1/mechanisms/ID/data-sets?name=run1"` },
  { method: "GET, DELETE", path: "/api/v1/mechanisms/:id/data-sets/:dataSetId", role: "viewer, editor", what: "The CSV as uploaded; DELETE removes it (editors). Fits that used it keep its name.", example: (o) => `curl ${auth} ${o}/api/v1/mechanisms/ID/data-sets/SET` },
  { method: "POST", path: "/api/v1/mechanisms/:id/fits", role: "editor", what: `Fit the current text's parameters by weighted least squares: { dataSets?: [ids], data?: [{ name, csv }], vary: ["k1", "[A]0", …], bounds?: { k1: { low?, high? } }, set?: { parameters, initial } } → the command line's fit --json ({ parameters: { k1: { value, stderr, low, high, start, atBound } }, cost, iterations, converged, correlation, residuals, warnings, … }) plus id and snapshotId (the version it ran on). At most ${MAX_FIT_DATA_SETS} data sets and ${MAX_FIT_PARAMETERS} parameters. A queued job like a simulation (Accept: application/x-ndjson for { queued } and { progress } lines; closing the request cancels it). Co-authors in the room see the fit appear.`, example: (o) => `curl ${auth} ${json} -d '{"dataSets":["SET"],"vary":["k1","k2"]}' ${o}/api/v1/mechanisms/ID/fits` },
  { method: "GET", path: "/api/v1/mechanisms/:id/fits[/:fitId]", role: "viewer", what: "Stored fits, newest first (or one, with the text it ran on): who ran it, the version, settings, status (running, done, failed), result or error.", example: (o) => `curl ${auth} ${o}/api/v1/mechanisms/ID/fits` },
  { method: "POST", path: "/api/v1/mechanisms/:id/fits/:fitId/apply", role: "editor", what: "Write a finished fit's values into the text where they are declared (one edit everyone in the room sees) and name the version \"fitted to <data sets>\" → { values, snapshot }.", example: (o) => `curl -X POST ${auth} ${o}/api/v1/mechanisms/ID/fits/FIT/apply` },
  { method: "POST", path: "/api/v1/mechanisms/:id/sensitivities", role: "viewer", what: "Normalized sensitivities ∂ln x/∂ln p: { until, samples, vary?, set? } → the command line's sensitivity --json ({ t, parameters, series, normalized: { SPECIES: { PARAM: [...] } } }); vary defaults to every named rate coefficient.", example: (o) => `curl ${auth} ${json} -d '{"until":50,"samples":51}' ${o}/api/v1/mechanisms/ID/sensitivities` },
  { method: "GET", path: "/api/v1/mechanisms/:id/export?format=sbml|latex|csv", role: "viewer", what: "SBML Level 3 Core, a LaTeX document, or the stoichiometric matrix as CSV.", example: (o) => `curl ${auth} -o mechanism.xml "${o}/api/v1/mechanisms/ID/export?format=sbml"` },
  { method: "POST", path: "/api/v1/mechanisms/import", role: "signed in", what: "Import an SBML file (multipart field file, or the raw XML as the body).", example: (o) => `curl ${auth} -F file=@model.xml ${o}/api/v1/mechanisms/import` },
  { method: "POST", path: "/api/v1/mechanisms/:id/invitations", role: "owner", what: "Invite by e-mail: { email, role }.", example: (o) => `curl ${auth} ${json} -d '{"email":"colleague@example.test","role":"editor"}' ${o}/api/v1/mechanisms/ID/invitations` },
  { method: "POST", path: "/api/v1/mechanisms/:id/view-links", role: "owner", what: "A read-only link: { expiresAt? } → { id, url }.", example: (o) => `curl ${auth} ${json} -d '{}' ${o}/api/v1/mechanisms/ID/view-links` },
  { method: "DELETE", path: "/api/v1/mechanisms/:id/view-links/:linkId", role: "owner", what: "Revoke a view link.", example: (o) => `curl -X DELETE ${auth} ${o}/api/v1/mechanisms/ID/view-links/LINK` },
  { method: "POST", path: "/api/v1/analyze", role: "signed in", what: "Analyse a text without saving it: { source }. A step with rate coefficient 0 is left out of the network, with a warning on its line.", example: (o) => `curl ${auth} ${json} -d '{"source":"X + Y -> 2Y @ 1"}' ${o}/api/v1/analyze` },
  { method: "POST", path: "/api/v1/realizations", role: "signed in", what: "Kinetic check and canonical realization of a polynomial ODE: { ode, shift?, multiply?, until?, equivalents?, complexes? }.", example: (o) => `curl ${auth} ${json} -d '{"ode":"x\\' = x - x*y\\ny\\' = x*y - y"}' ${o}/api/v1/realizations` },
  { method: "POST", path: "/api/v1/tokens", role: "browser session", what: "Create a token: { name } → { id, token } (shown once).", example: (o) => `curl -b cookies.txt ${json} -d '{"name":"script"}' ${o}/api/v1/tokens` },
  { method: "DELETE", path: "/api/v1/tokens/:id", role: "signed in", what: "Revoke a token; live-document sockets opened with it close within about a second.", example: (o) => `curl -X DELETE ${auth} ${o}/api/v1/tokens/TOKEN_ID` },
  {
    method: "GET",
    path: "/api/dev/mail",
    role: "demo owner's session",
    what: "Development only (no SMTP_URL): the mail the local catcher kept, newest first. Only the demo owner's browser session reads it: 401 signed out, 404 to everyone else, access tokens included.",
    example: (o) => `curl -b cookies.txt ${o}/api/dev/mail`,
  },
];

export default function ApiDocs({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <h1>JSON API</h1>
      <p className="mt-2 max-w-3xl text-sm text-muted">
        Every endpoint lives under <code>/api/v1/</code> and accepts your browser session or a personal access token
        (<a href="/settings/tokens">create one</a>) as <code>Authorization: Bearer TOKEN</code>. A token acts with your roles and has a budget of
        120 requests a minute. Errors are <code>{`{ "error": "message", "code": "…" }`}</code>: the message is for people, the code for
        scripts (see <a href="#errors">Errors</a>).
      </p>
      <p className="mt-2 max-w-3xl text-sm text-muted">
        Send bodies as JSON with <code>Content-Type: application/json</code> (only the SBML import also takes a file upload or raw XML). Text
        fields and mechanism texts refuse control characters other than tab, line feed and carriage return. A change whose{" "}
        <code>Origin</code> header names another site is refused; scripts send no <code>Origin</code> and are not affected.
      </p>
      <p className="mt-2 max-w-3xl text-sm text-muted">
        Every analysis of a text (analyze, a mechanism's <code>analysis</code>, exports, imports) runs off the server's event loop under a time
        limit, 20 s unless the operator sets <code>ANALYSIS_TIME_LIMIT_MS</code>. Simulations, sweeps and realizations run one per user at a
        time with up to three more waiting; asked with <code>Accept: application/x-ndjson</code>, they answer <code>{`{ "queued": n }`}</code>{" "}
        lines while waiting, then <code>{`{ "progress": f }`}</code> lines, then <code>{`{ "result": … }`}</code> or{" "}
        <code>{`{ "error": "…", "code": "…" }`}</code>. Their result's <code>stats.ranOn</code> names the server process that ran it.
      </p>
      <p className="mt-2 max-w-3xl text-sm text-muted">
        Limits: a JSON body up to {byteSize(MAX_JSON_BODY_BYTES)}, a mechanism text up to {byteSize(MAX_SOURCE_BYTES)}, an ODE up to{" "}
        {byteSize(MAX_ODE_BYTES)}, an SBML file up to {byteSize(MAX_SBML_BYTES)}; a run up to {MAX_SERVER_SAMPLES.toLocaleString("en")} samples, a
        sweep up to {MAX_SERVER_SWEEP_POINTS} points. Beyond them the answer is 413.
      </p>
      <ErrorTable />
      <div className="mt-6 space-y-3">
        {endpoints.map((e) => (
          <section key={e.method + e.path} className="card p-4">
            <div className="flex flex-wrap items-center gap-3">
              <span className="pill bg-accent-soft font-mono text-accent">{e.method}</span>
              <code className="text-sm font-medium">{e.path}</code>
              <span className="pill ml-auto border border-line text-muted">{e.role}</span>
            </div>
            <p className="mt-2 text-sm">{e.what}</p>
            <pre className="mt-2 overflow-x-auto rounded-md bg-canvas p-3 text-xs">{e.example(loaderData.origin)}</pre>
          </section>
        ))}
      </div>
    </main>
  );
}

/** The code → status table itself (app/shared/error-codes.ts), so the page cannot drift from it. */
function ErrorTable() {
  return (
    <section id="errors" className="mt-6 max-w-3xl">
      <h2 className="text-lg font-semibold">Errors</h2>
      <table className="mt-2 w-full text-left text-sm">
        <thead className="text-muted">
          <tr>
            {["Status", "Code", "Meaning"].map((heading) => (
              <th key={heading} className="py-1 pr-3 font-medium">
                {heading}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {(Object.entries(errorCodes) as [ErrorCode, (typeof errorCodes)[ErrorCode]][]).map(([code, { status, meaning }]) => (
            <tr key={code} className="border-t border-line align-top">
              <td className="py-1 pr-3 font-mono">{status}</td>
              <td className="py-1 pr-3">
                <code>{code}</code>
              </td>
              <td className="py-1">{meaning}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
