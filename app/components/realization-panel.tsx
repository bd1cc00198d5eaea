// "From ODE to mechanism": the polynomial ODE with its negative cross effects marked, the
// transformations on offer (the smallest multiplier is the one for the ODE shifted as last
// realized, or by the suggested shift when none was applied), and the resulting mechanism with the
// end time its own clock needs. Presentational: the route runs
// realizeOde and passes the result; choices come back through the callbacks.
import { useState } from "react";
import { readableNumberText } from "~/chem/numbers";
import type { CrossEffectReport, RealizeOdeResult } from "~/chem/realize/realize-ode";
import type { EquivalentRealization } from "~/chem/realize/equivalents";

export interface RealizationChoice {
  shift?: Record<string, number>;
  /** true: the product of all variables; an exponent map: that monomial. */
  multiply: boolean | Record<string, number>;
}

type MultiplierChoice = "none" | "smallest" | "all";

const monomialText = (exponents: Record<string, number>) =>
  Object.entries(exponents).map(([v, e]) => (e === 1 ? v : `${v}^${e}`)).join("*");

interface RealizationPanelProps {
  ode: string;
  result: RealizeOdeResult;
  /** The variables of the ODE, in order (for the shift fields). */
  variables: string[];
  busy?: boolean;
  onApply?: (choice: RealizationChoice) => void;
  /** With the extra candidate complexes the user typed (as in a mechanism: `2y`, `x + y`). */
  onSearchEquivalents?: (complexes: string[]) => void;
  onOpenMechanism?: (text: string) => void;
}

export function RealizationPanel({ ode, result, variables, busy, onApply, onSearchEquivalents, onOpenMechanism }: RealizationPanelProps) {
  const applied = result.transformations.find((t) => t.kind === "translation");
  const [shift, setShift] = useState<Record<string, string>>(() =>
    Object.fromEntries(variables.map((v) => [v, String((applied?.kind === "translation" ? applied.shift : result.suggestedShift)?.[v] ?? 0)])),
  );
  const [translateOn, setTranslateOn] = useState(Boolean(applied));
  const [multiplier, setMultiplier] = useState<MultiplierChoice>(
    result.transformations.some((t) => t.kind === "multiplication") ? "all" : "none",
  );
  const smallest = result.suggestedMultiplier;
  // Offered for the suggested shift when none was applied: choosing it turns that shift on.
  const smallestNeedsShift = !applied && Boolean(result.suggestedShift);
  const [complexes, setComplexes] = useState("");
  const given = result.original ?? { kinetic: result.kinetic, negativeCrossEffects: result.negativeCrossEffects };
  const errors = result.diagnostics.filter((d) => d.severity === "error");

  return (
    <section className="card bg-surface p-5 text-ink" aria-label="From ODE to mechanism">
      <h2>From ODE to mechanism</h2>
      <pre className="mt-3 overflow-x-auto rounded-md border border-line p-3 text-sm">
        <MarkedSource text={ode} effects={given.negativeCrossEffects} />
      </pre>
      {errors.length > 0 ? (
        <ul className="notice-error mt-3 list-none">
          {errors.map((d, k) => (
            <li key={k}>line {d.line}, column {d.column}: {d.message}</li>
          ))}
        </ul>
      ) : (
        <>
          <Verdict kinetic={given.kinetic} effects={given.negativeCrossEffects} />
          <fieldset className="mt-5 rounded-md border border-line p-4" disabled={busy}>
            <legend className="px-1 text-sm font-medium">Transformations</legend>
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" checked={translateOn} onChange={(e) => setTranslateOn(e.target.checked)} />
              Translate x → x + s
              {result.suggestedShift && <span className="text-muted">(s suggested from a simulated bounding box)</span>}
            </label>
            {translateOn && (
              <div className="mt-2 flex flex-wrap gap-3">
                {variables.map((v) => (
                  <label key={v} className="text-sm">
                    <span className="label">s for {v}</span>
                    <input
                      className="field w-28"
                      type="number"
                      step="any"
                      value={shift[v]}
                      onChange={(e) => setShift({ ...shift, [v]: e.target.value })}
                    />
                  </label>
                ))}
              </div>
            )}
            <div className="mt-3 text-sm" role="radiogroup" aria-label="Multiplier">
              <p>Multiply the right-hand sides by a positive monomial (same orbits in the positive orthant, another time scale):</p>
              {(
                [
                  ["none", "no multiplication"],
                  ...(smallest
                    ? [["smallest", `${monomialText(smallest)} — the smallest that removes every negative cross effect${smallestNeedsShift ? " after the suggested translation" : ""}`]]
                    : []),
                  ["all", `${variables.join("*")} — the product of all variables`],
                ] as [MultiplierChoice, string][]
              ).map(([value, label]) => (
                <label key={value} className="mt-1 flex items-center gap-2">
                  <input
                    type="radio"
                    name="multiplier"
                    checked={multiplier === value}
                    onChange={() => {
                      setMultiplier(value);
                      if (value === "smallest" && smallestNeedsShift) setTranslateOn(true);
                    }}
                  />
                  {label}
                </label>
              ))}
            </div>
            <button
              type="button"
              className="btn btn-primary mt-4"
              onClick={() =>
                onApply?.({
                  multiply: multiplier === "all" || (multiplier === "smallest" && smallest ? smallest : false),
                  shift: translateOn ? Object.fromEntries(variables.map((v) => [v, Number(shift[v]) || 0])) : undefined,
                })
              }
            >
              Apply
            </button>
          </fieldset>
          {result.transformedOde && (
            <>
              <h3 className="mt-5">Transformed ODE</h3>
              <pre className="mt-2 overflow-x-auto rounded-md border border-line p-3 text-sm">{result.transformedOde}</pre>
              {result.transformations.length > 0 && <Verdict kinetic={result.kinetic} effects={result.negativeCrossEffects} />}
            </>
          )}
          {result.notes.length > 0 && (
            <ul className="mt-4 space-y-1 text-sm text-muted">
              {result.notes.map((note) => (
                <li key={note}>{note}</li>
              ))}
            </ul>
          )}
          {result.mechanism && (
            <MechanismBlock
              title={`Canonical realization — ${result.reactions} steps, order ${result.maxOrder}`}
              text={result.mechanism}
              onOpen={onOpenMechanism}
            />
          )}
          {result.mechanism && result.clock?.suggestedUntil != null && (
            <p className="mt-2 text-sm" data-testid="realization-clock">
              On its own clock (dt = {result.clock.multiplier} · ds), simulate this mechanism until s ={" "}
              {readableNumberText(result.clock.suggestedUntil, 2)} to cover the ODE&apos;s 0 ≤ t ≤ {result.clock.originalUntil}.
            </p>
          )}
          {result.mechanism && onSearchEquivalents && (
            <div className="mt-5 flex flex-wrap items-end gap-3">
              <label className="min-w-64 flex-1 text-sm">
                <span className="label">Extra candidate complexes (optional, comma-separated)</span>
                <input className="field font-mono" value={complexes} placeholder="e.g. 2y, x + y" onChange={(e) => setComplexes(e.target.value)} />
              </label>
              <button
                type="button"
                className="btn"
                disabled={busy}
                onClick={() => onSearchEquivalents(complexes.split(",").map((c) => c.trim()).filter(Boolean))}
              >
                Search sparse, dense and weakly reversible mechanisms with the same dynamics
              </button>
            </div>
          )}
          {result.equivalents && (
            <div className="mt-5">
              <p className="text-sm text-muted">Searched over {result.equivalents.complexes} candidate complexes.</p>
              <Equivalent title="Sparse (fewest reactions)" found={result.equivalents.sparse} onOpen={onOpenMechanism} />
              <Equivalent title="Dense (most reactions)" found={result.equivalents.dense} onOpen={onOpenMechanism} />
              <Equivalent title="Weakly reversible" found={result.equivalents.weaklyReversible} onOpen={onOpenMechanism} />
            </div>
          )}
        </>
      )}
    </section>
  );
}

/** The ODE text with the summands that carry a negative cross effect underlined. */
function MarkedSource({ text, effects }: { text: string; effects: CrossEffectReport[] }) {
  const spans = effects.flatMap((e) => e.spans).sort((a, b) => a.from - b.from);
  const pieces: React.ReactNode[] = [];
  let at = 0;
  spans.forEach((span, k) => {
    if (span.from < at) return;
    pieces.push(text.slice(at, span.from));
    pieces.push(
      <mark key={k} className="rounded-sm bg-transparent text-accent underline decoration-wavy">
        {text.slice(span.from, span.to)}
      </mark>,
    );
    at = span.to;
  });
  pieces.push(text.slice(at));
  return <code>{pieces}</code>;
}

function Verdict({ kinetic, effects }: { kinetic: boolean; effects: CrossEffectReport[] }) {
  if (kinetic) return <p className="mt-3 text-sm">Kinetic: no negative cross effect, so a mass-action mechanism realizes it.</p>;
  return (
    <div className="mt-3 text-sm">
      <p>Not kinetic. Negative cross effects (a negative term in x′ without x):</p>
      <ul className="mt-1 list-disc pl-5">
        {effects.map((e) => (
          <li key={`${e.equation}:${e.term}`}>
            <code className="text-accent">{e.term}</code> in <code>{e.equation}′</code>
          </li>
        ))}
      </ul>
    </div>
  );
}

function MechanismBlock({ title, text, onOpen }: { title: string; text: string; onOpen?: (text: string) => void }) {
  return (
    <div className="mt-5">
      <div className="flex items-center justify-between gap-3">
        <h3>{title}</h3>
        {onOpen && (
          <button type="button" className="btn" onClick={() => onOpen(text)}>
            Open as a new mechanism
          </button>
        )}
      </div>
      <pre className="mt-2 max-h-80 overflow-auto rounded-md border border-line p-3 text-sm">{text}</pre>
    </div>
  );
}

const outcomeText: Record<EquivalentRealization["status"], string> = {
  found: "",
  infeasible: "none exists on these candidate complexes",
  "time-limit": "the time limit ran out",
  undetermined: "undetermined",
};

function Equivalent({ title, found, onOpen }: { title: string; found: EquivalentRealization; onOpen?: (text: string) => void }) {
  if (found.status !== "found" || !found.mechanism) {
    return (
      <p className="mt-3 text-sm">
        <span className="font-medium">{title}:</span> <span className="text-muted">{found.reason ?? outcomeText[found.status]}</span>
      </p>
    );
  }
  const proof = found.optimal ? "" : " (best found before the time limit, not proved optimal)";
  return <MechanismBlock title={`${title} — ${found.reactions} steps${proof}`} text={found.mechanism} onOpen={onOpen} />;
}
