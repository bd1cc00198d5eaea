// The multistationarity witness: rate coefficients per reaction and two or more steady states in
// one class, shown so anyone can check them. `WitnessSearch` runs the longer search as a queued job
// (the analysis on every change has no time for it), with progress and cancel.
import { combinationText } from "~/chem/expression";
import type { MultistationarityWitness } from "~/chem/multistationarity";
import { readableNumberText } from "~/chem/numbers";
import type { WitnessSearchResult } from "~/chem/witness-search";
import { DEFAULT_WITNESS_JOB_MS } from "~/chem/limits";
import { JobStatus } from "./dynamics/job-status";
import { useDynamicsJob } from "./dynamics/use-dynamics-job";

export function WitnessSearch({ mechanismId, source }: { mechanismId: string; source: () => string }) {
  const job = useDynamicsJob<WitnessSearchResult>(`/api/v1/mechanisms/${mechanismId}/dynamics`);
  const result = job.result;
  return (
    <div className="space-y-1.5" data-testid="witness-search">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-muted">{result ? "" : `It runs on the server for up to ${DEFAULT_WITNESS_JOB_MS / 1000} s.`}</p>
        {job.running ? (
          <button type="button" className="btn btn-danger" onClick={job.cancel}>Cancel</button>
        ) : (
          <button type="button" className="btn" onClick={() => job.run({ kind: "witness", source: source(), options: { budgetMs: DEFAULT_WITNESS_JOB_MS } })}>
            Run the witness search
          </button>
        )}
      </div>
      <JobStatus job={job} />
      {result && !job.running && (
        <div data-testid="witness-result">
          {/* The reason repeats the determinant's count the card already states; with a witness the count of states says it. */}
          <p>
            {result.multistationarity.witness
              ? `Found: ${result.multistationarity.witness.equilibria.length} distinct positive steady states in one class at these rate coefficients, each with its residual below.`
              : result.multistationarity.reason}
          </p>
          {result.multistationarity.witness && <WitnessDetails reactions={result.reactions} witness={result.multistationarity.witness} checks={result} open />}
        </div>
      )}
    </div>
  );
}

/** The witness; with `checks`, each steady state's residual and conserved totals, and whether they agree. */
export function WitnessDetails({ reactions, witness, checks, open = false }: { reactions: string[]; witness: MultistationarityWitness; checks?: Omit<WitnessSearchResult, "multistationarity">; open?: boolean }) {
  return (
    <details open={open}>
      <summary className="cursor-pointer text-muted">Witness: rate coefficients (in place of the text's) and steady states</summary>
      <p className="mt-1 font-mono text-xs">
        {reactions.map((reaction, r) => `${reaction}: ${readableNumberText(witness.rates[r], 4)}`).join("; ")}
      </p>
      <ol className="mt-1 list-decimal pl-5 font-mono text-xs">
        {witness.equilibria.map((state, index) => (
          <li key={index}>
            {Object.entries(state).map(([name, value]) => `[${name}] = ${readableNumberText(value, 4)}`).join(", ")}
            {checks && <span className="block text-muted">{`residual ${readableNumberText(checks.checks[index].residual, 2)} (largest |d[X]/dt| over the largest reaction rate)`}</span>}
          </li>
        ))}
      </ol>
      {checks && <p className="mt-1 text-xs" data-testid="witness-totals">{totalsText(checks)}</p>}
    </details>
  );
}

/** Whether every steady state has the same conserved totals (to 10⁻⁶ relative), written out. */
function totalsText({ checks, conservationLaws, species }: Omit<WitnessSearchResult, "multistationarity">): string {
  if (conservationLaws.length === 0) return "There are no conservation laws: every steady state lies in the one class.";
  const first = checks[0].totals;
  const shared = checks.every(({ totals }) => totals.every((total, k) => Math.abs(total - first[k]) <= 1e-6 * Math.max(Math.abs(first[k]), Number.MIN_VALUE)));
  const laws = conservationLaws.map((law, k) => `${combinationText(law, species)} = ${readableNumberText(first[k], 6)}`).join(", ");
  return shared
    ? `All ${checks.length} steady states share the conservation-law totals: ${laws}.`
    : `The steady states do not share the conservation-law totals (the first has ${laws}).`;
}
