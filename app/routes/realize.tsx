// From ODE to mechanism: type a polynomial ODE, see its negative cross effects, apply the
// suggested translation and multiplication, and open a realization as a new mechanism.
import { useState } from "react";
import { redirect, useFetcher } from "react-router";
import { z } from "zod";
import { createMechanism } from "~/utils/mechanisms.server";
import { JobStatus } from "~/components/dynamics/job-status";
import { useDynamicsJob } from "~/components/dynamics/use-dynamics-job";
import { RealizationCheck } from "~/components/realization-check";
import { RealizationPanel, type RealizationChoice } from "~/components/realization-panel";
import type { RealizeOdeResult } from "~/chem/realize/realize-ode";
import { parseOde } from "~/chem/ode/parse";
import { requireUser } from "~/utils/auth.server";
import { odeField, sourceField, titleField } from "~/shared/fields";
import type { Route } from "./+types/realize";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "From ODE to mechanism · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  await requireUser(args);
  return null;
}

const openForm = z.object({ title: titleField, mechanism: sourceField, ode: odeField });

/** Opens a realization as a new mechanism owned by the caller, the ODE kept in its summary. */
export async function action(args: Route.ActionArgs) {
  const user = await requireUser(args);
  const parsed = openForm.safeParse(Object.fromEntries(await args.request.formData()));
  if (!parsed.success) return httpError("bad_input", parsed.error.issues[0].message);
  const { title, mechanism, ode } = parsed.data;
  const row = await createMechanism(args.context.db, user.id, { title, source: mechanism, summary: `Realization of the ODE:\n${ode.trim()}` });
  throw redirect(`/m/${row.id}`);
}

const example = `# The Lorenz system, written as a polynomial ODE
sigma = 10
rho = 28
beta = 8/3
x' = sigma*(y - x)
y' = x*(rho - z) - y
z' = x*y - beta*z
x(0) = 1
y(0) = 1
z(0) = 1
`;

export default function Realize() {
  const [ode, setOde] = useState(example);
  const [checked, setChecked] = useState(example);
  // Streamed, so the slower searches for equivalent mechanisms show their progress.
  const check = useDynamicsJob<RealizeOdeResult>("/api/v1/realizations");
  const result = check.result;
  const open = useFetcher();
  const [title, setTitle] = useState("Realization");

  function submit(extra: Partial<RealizationChoice> & { equivalents?: boolean; complexes?: string[] }) {
    setChecked(ode);
    void check.run({ ode, ...extra });
  }
  const variables = parseOde(checked).ode?.variables ?? [];

  return (
    <main className="mx-auto max-w-7xl px-6 py-8">
      <h1>From ODE to mechanism</h1>
      <p className="mt-1 max-w-3xl text-sm text-muted">
        Write a polynomial ODE, one equation a line (<code>x' = …</code> or <code>dx/dt = …</code>), with parameters as <code>name = number</code> and initial
        values as <code>x(0) = …</code>. Mechweave tells whether some mass-action mechanism has exactly this ODE and, if not, which transformation makes one exist.
      </p>
      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
        <section className="card flex flex-col p-4">
          <label className="label" htmlFor="ode">Polynomial ODE</label>
          <textarea
            id="ode"
            className="field min-h-80 flex-1 font-mono text-sm leading-relaxed"
            spellCheck={false}
            value={ode}
            onChange={(e) => setOde(e.target.value)}
          />
          <div className="mt-3 flex gap-2">
            <button className="btn btn-primary" type="button" onClick={() => submit({})} disabled={check.running}>
              {check.running ? "Working…" : "Check and realize"}
            </button>
            {check.running && <button className="btn" type="button" onClick={check.cancel}>Cancel</button>}
          </div>
          {open.data && (open.data as { error?: string }).error && <p className="notice-error mt-3">{(open.data as { error: string }).error}</p>}
          <label className="label mt-4" htmlFor="new-title">Title for a mechanism opened from here</label>
          <input id="new-title" className="field" value={title} onChange={(e) => setTitle(e.target.value)} maxLength={200} />
        </section>
        <div>
          <JobStatus job={check} />
          {!result && <p className="card p-6 text-sm text-muted">The verdict, the negative cross effects and the realization appear here.</p>}
          {result && (
            <RealizationPanel
              ode={checked}
              result={result}
              variables={variables}
              busy={check.running}
              onApply={(choice) => submit(choice)}
              onSearchEquivalents={(complexes) => submit({ equivalents: true, complexes, ...lastChoice(result) })}
              onOpenMechanism={(mechanism) => open.submit({ title, mechanism, ode: checked }, { method: "post" })}
            />
          )}
          {result?.mechanism && <RealizationCheck key={result.mechanism} ode={checked} result={result} variables={variables} />}
        </div>
      </div>
    </main>
  );
}

/** Keeps the transformations of the shown result when searching for equivalents. */
function lastChoice(result: RealizeOdeResult): RealizationChoice {
  const translation = result.transformations.find((t) => t.kind === "translation");
  const multiplication = result.transformations.find((t) => t.kind === "multiplication");
  return {
    shift: translation?.kind === "translation" ? translation.shift : undefined,
    multiply: multiplication?.kind === "multiplication" ? multiplication.exponents : false,
  };
}
