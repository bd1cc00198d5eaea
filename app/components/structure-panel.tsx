// The structure of a mechanism at a glance: counts, the theorems' verdicts and the behaviour
// verdicts beside them (behaviour-verdicts.tsx), linkage classes with
// their strong and terminal classes, conservation laws, the induced ODEs typeset, the
// stoichiometric matrix and the detailed-balance conditions. Presentational: it shows a report.
import katex from "katex";
import "katex/dist/katex.min.css";
import { useMemo, type ReactNode } from "react";
import type { RoomEquations, RoomReport } from "~/shared/analysis-map";
import { BehaviourVerdicts, type WitnessJobTarget } from "./behaviour-verdicts";
import { denseStoichiometricMatrix } from "~/chem/stoichiometry";
import { combinationLatex } from "~/chem/expression";
import { readableNumberLatex, readableNumberText } from "~/chem/numbers";
import type { TheoremVerdict } from "~/chem/theorems";

/** Typesetting thousands of formulas would stall the page; beyond this many the rest are counted. */
const shownFormulas = 200;

export interface StructurePanelProps {
  report: RoomReport;
  /** The room sends them apart from the report; null until they have been read. */
  equations: RoomEquations | null;
  witnessJob?: WitnessJobTarget;
}

export function StructurePanel({ report, equations, witnessJob }: StructurePanelProps) {
  const { species, complexes, reactions } = report;
  return (
    <section className="card space-y-5 p-5 text-ink" aria-label="Structure">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2>Structure</h2>
        <Flags report={report} />
      </header>

      <dl className="grid grid-cols-3 gap-2 sm:grid-cols-6">
        <Stat label="species" value={species.length} />
        <Stat label="complexes" value={complexes.length} />
        <Stat label="reactions" value={reactions.length} />
        <Stat label="linkage classes" value={report.linkageClasses.length} />
        <Stat label="rank" value={report.rank} />
        <Stat label="deficiency" value={report.deficiency} emphasis />
      </dl>

      <Diagnostics report={report} />

      <div className="grid gap-3 md:grid-cols-2">
        <Verdict title="Deficiency Zero Theorem" verdict={report.theorems.deficiencyZero} />
        <Verdict title="Deficiency One Theorem" verdict={report.theorems.deficiencyOne} />
      </div>
      <BehaviourVerdicts report={report} witnessJob={witnessJob} />

      {complexes.length > 0 && (
        <Section title="Linkage classes">
          <LinkageClasses report={report} />
        </Section>
      )}

      {species.length > 0 && (
        <Section title="Conservation laws and the compatibility class">
          {report.conservationLaws.length === 0 ? (
            <p className="text-sm text-muted">None: the reactions can change every combination of concentrations.</p>
          ) : (
            <Formulas
              latex={report.conservationLaws.map((law, k) => `${combinationLatex(law, species)} = ${readableNumberLatex(report.compatibilityClass.totals[k], 4)}`)}
            />
          )}
          <p className="mt-2 text-sm" data-testid="compatibility-class">
            {compatibilityClassText(report)}
          </p>
          <p className="mt-2 text-sm">
            {report.massConserving
              ? "A conservation law gives every species a positive weight: total mass is conserved and concentrations stay bounded."
              : "No conservation law gives every species a positive weight."}
          </p>
        </Section>
      )}

      {species.length > 0 && (
        <Section title="Induced kinetic differential equations">
          {equations ? (
            <Formulas latex={species.map((name) => equations.odesLatex[name])} titles={species.map((name) => coefficientValues(report, equations, name))} wrap />
          ) : (
            <p className="text-sm text-muted">Reading the equations…</p>
          )}
          {report.customLaws.length > 0 && (
            <p className="mt-2 rounded-md bg-signal-soft px-3 py-2 text-sm text-signal">
              Not mass action: {report.customLaws.map(({ reaction, law, lines }) => `${reactionText(report, reaction)} uses ${law} (line ${lines.join(", ")})`).join("; ")}.
            </p>
          )}
        </Section>
      )}

      {reactions.length > 0 && (
        <Section title="Reactions and stoichiometric matrix">
          <ReactionList report={report} />
          <StoichiometricMatrix report={report} />
        </Section>
      )}

      {reactions.length > 0 && (
        <Section title="Detailed balance">
          <DetailedBalanceConditions report={report} />
        </Section>
      )}

      {Object.keys(report.fixedSpecies).length > 0 && (
        <Section title="Fixed species">
          <p className="text-sm">
            {Object.entries(report.fixedSpecies).map(([name, value]) => `[${name}] = ${value}`).join(", ")}
            <span className="text-muted"> — held constant, folded into the rate coefficients.</span>
          </p>
        </Section>
      )}
    </section>
  );
}

function compatibilityClassText(report: RoomReport): string {
  const { dimension, totals } = report.compatibilityClass;
  const n = report.species.length;
  const directions = `${dimension} independent direction${dimension === 1 ? "" : "s"}`;
  if (totals.length === 0) {
    return `The reactions move the concentrations in ${directions}, as many as there are species: no total is fixed, and the simulation may reach any non-negative state the kinetics lead to.`;
  }
  return `The simulation stays in the compatibility class of its initial state: the reactions move the ${n} concentrations in only ${directions} (the stoichiometric subspace), so the ${totals.length === 1 ? "total above keeps its initial value" : `${totals.length} totals above keep their initial values`}. Equilibria are searched for within this class.`;
}

function Stat({ label, value, emphasis }: { label: string; value: number; emphasis?: boolean }) {
  return (
    <div className={`rounded-lg border border-line px-3 py-2 ${emphasis ? "bg-accent-soft" : ""}`}>
      <dt className="text-xs text-muted">{label}</dt>
      <dd className={`font-mono text-lg ${emphasis ? "text-accent" : ""}`}>{value}</dd>
    </div>
  );
}

function Flags({ report }: { report: RoomReport }) {
  const flag = (label: string, on: boolean) => (
    <span className={`pill ${on ? "bg-accent-soft text-accent" : "border border-line text-muted"}`}>
      {on ? label : `not ${label}`}
    </span>
  );
  return (
    <div className="flex flex-wrap gap-1.5">
      {flag("reversible", report.reversible)}
      {flag("weakly reversible", report.weaklyReversible)}
      {flag("mass conserving", report.massConserving)}
    </div>
  );
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section>
      <h3 className="mb-2">{title}</h3>
      {children}
    </section>
  );
}

function Diagnostics({ report }: { report: RoomReport }) {
  if (report.diagnostics.length === 0) return null;
  return (
    <ul className="space-y-1 text-sm" aria-label="Diagnostics">
      {report.diagnostics.map((d, index) => (
        <li
          key={index}
          className={`rounded-md px-3 py-1.5 ${d.severity === "error" ? "bg-danger-soft text-danger" : "bg-signal-soft text-signal"}`}
        >
          <span className="font-mono">
            {d.line}:{d.column}
          </span>{" "}
          {d.message}
        </li>
      ))}
    </ul>
  );
}

function Verdict({ title, verdict }: { title: string; verdict: TheoremVerdict }) {
  return (
    <article className={`rounded-lg border p-3 ${verdict.applies ? "border-accent bg-accent-soft" : "border-line"}`}>
      <div className="flex items-center justify-between gap-2">
        <h4 className="text-sm font-semibold">{title}</h4>
        <span className={`pill ${verdict.applies ? "bg-accent text-accent-ink" : "border border-line text-muted"}`}>
          {verdict.applies ? "applies" : "silent"}
        </span>
      </div>
      <p className="mt-1.5 text-sm leading-relaxed">{verdict.conclusion}</p>
    </article>
  );
}

/** Each linkage class with its strong linkage classes as groups; terminal groups are marked. */
function LinkageClasses({ report }: { report: RoomReport }) {
  const terminal = new Set(report.terminalStrongLinkageClasses.map((members) => members[0]));
  const classOf = new Map<number, number>();
  report.linkageClasses.forEach((members, index) => members.forEach((complex) => classOf.set(complex, index)));
  return (
    <ol className="space-y-2">
      {report.linkageClasses.map((_, index) => (
        <li key={index} className="rounded-lg border border-line p-2.5">
          <div className="mb-1.5 flex justify-between text-xs text-muted">
            <span>class {index + 1}</span>
            <span>deficiency {report.linkageClassDeficiencies[index]}</span>
          </div>
          <div className="flex flex-wrap gap-2">
            {report.strongLinkageClasses
              .filter((strong) => classOf.get(strong[0]) === index)
              .map((strong) => {
                const isTerminal = terminal.has(strong[0]);
                return (
                  <span
                    key={strong[0]}
                    title={isTerminal ? "terminal strong linkage class: no reaction leaves it" : "strong linkage class"}
                    className={`inline-flex flex-wrap items-center gap-1 rounded-md border px-1.5 py-1 ${isTerminal ? "border-accent bg-accent-soft" : "border-dashed border-line"}`}
                  >
                    {strong.map((complex) => (
                      <code key={complex} className="rounded bg-surface px-1.5 text-sm">
                        {report.complexes[complex]}
                      </code>
                    ))}
                    {isTerminal && <span className="text-xs text-accent">terminal</span>}
                  </span>
                );
              })}
          </div>
        </li>
      ))}
    </ol>
  );
}

/**
 * Typeset formulas, one a line. `wrap` lets a long one break between terms, continuing indented
 * under its start (inline KaTeX breaks after + and − and at \allowbreak), so it stays within the
 * panel at any width; a single term too long for a line still scrolls. `titles` show on hover.
 */
function Formulas({ latex, titles, wrap = false }: { latex: string[]; titles?: string[]; wrap?: boolean }) {
  // Callers build the list afresh on every render; the joined text is what identifies it.
  const shown = latex.slice(0, shownFormulas).join("\n");
  const html = useMemo(
    () => shown.split("\n").map((formula) => katex.renderToString(formula, { throwOnError: false, displayMode: false })),
    [shown],
  );
  if (latex.length === 0) return null;
  return (
    <div className="space-y-1.5 overflow-x-auto">
      {html.map((markup, index) => (
        <div key={index} title={titles?.[index] || undefined} style={wrap ? hangingIndent : undefined} dangerouslySetInnerHTML={{ __html: markup }} />
      ))}
      {latex.length > shownFormulas && <p className="text-sm text-muted">… and {latex.length - shownFormulas} more.</p>}
    </div>
  );
}

const hangingIndent = { paddingLeft: "2em", textIndent: "-2em" } as const;

/** "k1 = 2.5×10⁹, k7 = 0.3": the values behind the names in one species' equation. */
function coefficientValues(report: RoomReport, equations: RoomEquations, species: string): string {
  const names = new Set(equations.odes[species]?.replace(/"[^"]*"/g, "").match(/[A-Za-z][A-Za-z0-9_]*/g));
  return Object.entries(report.parameters)
    .filter(([name]) => names.has(name))
    .map(([name, value]) => `${name} = ${readableNumberText(value)}`)
    .join(", ");
}

function reactionText(report: RoomReport, index: number): string {
  const { from, to } = report.reactions[index];
  return `${report.complexes[from]} → ${report.complexes[to]}`;
}

/** Folded away by default: the matrix header already names each column. */
function ReactionList({ report }: { report: RoomReport }) {
  const custom = new Set(report.customLaws.map(({ reaction }) => reaction));
  return (
    <details className="mb-2 text-sm">
      <summary className="cursor-pointer text-muted">{report.reactions.length} reactions</summary>
      <ol className="mt-1.5 grid gap-x-6 gap-y-0.5 font-mono text-xs sm:grid-cols-2">
        {report.reactions.map((reaction, index) => (
          <li key={index}>
            <span className="text-muted">{`r${index + 1} `}</span>
            {reactionText(report, index)}
            <span className="text-muted">
              {custom.has(index) ? "  custom law" : reaction.rate === null ? "  no value yet" : `  k = ${reaction.rate}`}
            </span>
          </li>
        ))}
      </ol>
    </details>
  );
}

/** A bigger table is more scrolling than reading; the CSV export holds every entry. */
const matrixTableEntryLimit = 20_000;

function StoichiometricMatrix({ report }: { report: RoomReport }) {
  const { species, reactions } = report;
  const matrix = useMemo(() => (species.length * reactions.length <= matrixTableEntryLimit ? denseStoichiometricMatrix(report) : null), [report]);
  if (!matrix) {
    return (
      <p className="text-sm text-muted">
        {species.length} × {reactions.length} is too large to show as a table; download it as CSV under Files &amp; settings. The rank and
        conservation laws above come from it.
      </p>
    );
  }
  return (
    <div className="overflow-x-auto rounded-lg border border-line">
      <table className="min-w-full border-collapse font-mono text-xs">
        <thead>
          <tr className="bg-canvas">
            <th className="sticky left-0 bg-canvas px-2 py-1 text-left font-normal text-muted">species</th>
            {reactions.map((_, column) => (
              <th key={column} className="px-2 py-1 text-right font-normal text-muted" title={reactionText(report, column)}>
                {`r${column + 1}`}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {matrix.map((row, index) => (
            <tr key={index} className="border-t border-line">
              <th className="sticky left-0 bg-surface px-2 py-1 text-left font-medium">{species[index]}</th>
              {row.map((value, column) => (
                <td key={column} className={`px-2 py-1 text-right ${value === 0 ? "text-muted" : value > 0 ? "text-accent" : ""}`}>
                  {value === 0 ? "·" : value}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function DetailedBalanceConditions({ report }: { report: RoomReport }) {
  const balance = report.detailedBalance;
  const verdict =
    balance.satisfied === null ? null : balance.satisfied ? (
      <span className="pill bg-ok-soft text-ok">the given coefficients satisfy them</span>
    ) : (
      <span className="pill bg-danger-soft text-danger">the given coefficients do not satisfy them</span>
    );
  return (
    <div className="space-y-2 text-sm">
      <p>
        {balance.note} {verdict}
      </p>
      {balance.circuitConditions.length > 0 && (
        <div>
          <h4 className="mb-1 text-xs text-muted">Circuit conditions (one per independent cycle)</h4>
          <Formulas latex={balance.circuitConditions.map((condition) => condition.latex)} />
        </div>
      )}
      {balance.spanningForestConditions.length > 0 && (
        <div>
          <h4 className="mb-1 text-xs text-muted">Spanning-forest conditions (one per dependency among reaction vectors)</h4>
          <Formulas latex={balance.spanningForestConditions.map((condition) => condition.latex)} />
        </div>
      )}
    </div>
  );
}
