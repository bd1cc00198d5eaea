// One stored fit: the estimates with standard errors and 95 % intervals, the identifiability
// warnings in words, the correlation matrix as coloured cells, residuals per species, and for
// editors the button that writes the values into the text.
import { useMemo, useState } from "react";
import type * as Y from "yjs";
import { declaredValueEdits } from "~/chem/declared-values";
import { applyTextEdits } from "~/shared/text-edits";
import { readableNumberText } from "~/chem/numbers";
import { chartSvg } from "~/components/dynamics/chart-svg";
import { TimeAgo } from "~/components/time-ago";
import { currentThemeColours } from "~/utils/graph-svg";
import { cellInk, divergingColour } from "./colour-scale";
import { residualPicture, residualSpecies } from "./fit-charts";
import type { FitEntry } from "./use-fits";

interface Props {
  mechanismId: string;
  fit: FitEntry;
  canEdit: boolean;
  /** The live text, for undoing an apply as one edit everyone sees. */
  source: Y.Text | null;
}

const number = (value: number) => readableNumberText(value, 4);

export function FitResultView({ mechanismId, fit, canEdit, source }: Props) {
  const [applying, setApplying] = useState<string | null>(null);
  const [previous, setPrevious] = useState<Record<string, number> | null>(null);
  const result = fit.result;
  const names = fit.settings.dataSets.map((dataSet) => dataSet.name).join(", ");

  async function apply() {
    setApplying("Writing the values into the text…");
    const response = await fetch(`/api/v1/mechanisms/${mechanismId}/fits/${fit.id}/apply`, { method: "POST" });
    const body = (await response.json().catch(() => null)) as { error?: string; snapshot?: { name: string }; previous?: Record<string, number> } | null;
    setApplying(response.ok ? `Applied: the text now holds the fitted values, saved as the version “${body?.snapshot?.name}”.` : (body?.error ?? `The server answered ${response.status}.`));
    setPrevious(response.ok ? (body?.previous ?? null) : null);
  }

  /** Puts the replaced values back where they are declared now, as one edit everyone sees. */
  function undo() {
    if (!source || !previous || !source.doc) return;
    const { edits, undeclared } = declaredValueEdits(source.toString(), previous);
    if (undeclared.length > 0) return setApplying(`Not undone: the text no longer declares ${undeclared.join(", ")}.`);
    source.doc.transact(() => applyTextEdits(source, edits));
    setPrevious(null);
    setApplying("Undone: the values from before the fit are back in the text.");
  }

  return (
    <section className="card p-4" data-testid="fit-result" data-fit-id={fit.id}>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h3>Fit to {names}</h3>
          <p className="text-xs text-muted">
            {fit.ranBy ?? "Someone"} · <TimeAgo at={fit.createdAt} />
            {fit.snapshotId !== null && <> · on version #{fit.snapshotId}</>}
            {result && <> · cost {number(result.cost)} · {result.iterations} iterations · {result.points} points · {result.converged ? "converged" : "not converged"} ({result.stopped})</>}
          </p>
        </div>
        {canEdit && result && (
          <button type="button" className="btn btn-primary" onClick={() => void apply()} data-testid="apply-fit">Apply values to the text</button>
        )}
      </div>
      {applying && (
        <p className="mt-2 flex items-center gap-3 text-xs text-muted" role="status">
          <span data-testid="apply-status">{applying}</span>
          {previous && <button type="button" className="btn py-0.5 text-xs" onClick={undo} data-testid="undo-apply">Undo</button>}
        </p>
      )}
      {fit.status === "running" && <p className="mt-3 text-sm text-muted">Running…</p>}
      {fit.status === "failed" && <p className="notice-error mt-3">{fit.error}</p>}
      {result && <FitDetails fit={fit} />}
    </section>
  );
}

function FitDetails({ fit }: { fit: FitEntry }) {
  const result = fit.result!;
  const parameters = Object.keys(result.parameters);
  const warnings = [...result.warnings, ...(result.dataWarnings ?? [])];
  return (
    <>
      {warnings.length > 0 && (
        <ul className="mt-3 space-y-1 rounded-md border border-signal bg-signal-soft px-3 py-2 text-xs text-signal" data-testid="fit-warnings">
          {warnings.map((warning) => <li key={warning}>{warning}</li>)}
        </ul>
      )}
      <table className="mt-3 w-full text-sm" data-testid="fit-parameters">
        <thead className="text-left text-xs uppercase tracking-wider text-muted">
          <tr><th className="py-1">Parameter</th><th>Start</th><th>Estimate</th><th>Std. error</th><th>95 % interval</th><th /></tr>
        </thead>
        <tbody>
          {parameters.map((name) => {
            const p = result.parameters[name];
            return (
              <tr key={name} className="border-t border-line">
                <td className="py-1 font-mono">{name}</td>
                <td className="text-muted">{number(p.start)}</td>
                <td className="font-medium">{number(p.value)}</td>
                <td>{Number.isFinite(p.stderr) ? number(p.stderr) : "—"}</td>
                <td>{Number.isFinite(p.low) && Number.isFinite(p.high) ? `${number(p.low)} … ${number(p.high)}` : "—"}</td>
                <td className="text-xs text-signal">{p.atBound ? "at a bound" : ""}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-1 text-xs text-muted">
        {result.weighted ? "Weighted by the data's standard deviations." : "Unweighted: standard errors are scaled by the residual variance."} Intervals come from the linearised covariance in log space.
      </p>
      {parameters.length > 1 && <CorrelationMatrix names={parameters} correlation={result.correlation} />}
      <ResidualPlots fit={fit} />
    </>
  );
}

function CorrelationMatrix({ names, correlation }: { names: string[]; correlation: Record<string, Record<string, number>> }) {
  return (
    <div className="mt-4">
      <h4 className="text-sm font-medium">Correlation of the estimates</h4>
      <table className="mt-2 border-separate border-spacing-0.5 text-xs" data-testid="fit-correlation">
        <thead>
          <tr><th />{names.map((name) => <th key={name} className="px-2 font-mono font-normal text-muted">{name}</th>)}</tr>
        </thead>
        <tbody>
          {names.map((row) => (
            <tr key={row}>
              <th className="pr-2 text-right font-mono font-normal text-muted">{row}</th>
              {names.map((column) => {
                const value = correlation[row]?.[column] ?? NaN;
                return (
                  <td key={column} className="min-w-14 rounded px-2 py-1 text-center tabular-nums" style={{ background: divergingColour(value), color: cellInk(value) }} title={`${row} × ${column}`}>
                    {Number.isFinite(value) ? value.toFixed(2) : "—"}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function ResidualPlots({ fit }: { fit: FitEntry }) {
  const result = fit.result!;
  const species = useMemo(() => residualSpecies(result.residuals), [result]);
  const [chosen, setChosen] = useState<string | null>(null);
  const shown = chosen && species.includes(chosen) ? chosen : species[0];
  const svg = useMemo(() => (shown ? chartSvg(residualPicture(result.residuals, shown, result.weighted), currentThemeColours()) : ""), [result, shown]);
  if (!shown) return null;
  return (
    <div className="mt-4">
      <div className="flex flex-wrap items-center gap-2">
        <h4 className="text-sm font-medium">Residuals</h4>
        {species.map((name) => (
          <button key={name} type="button" className={`rounded px-2 py-0.5 text-xs ${name === shown ? "bg-accent text-white" : "border border-line"}`} onClick={() => setChosen(name)}>
            {name}
          </button>
        ))}
      </div>
      <div className="mt-2 overflow-x-auto" data-testid="residual-plot" dangerouslySetInnerHTML={{ __html: svg }} />
    </div>
  );
}
