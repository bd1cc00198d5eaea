// What the structure says about behaviour beyond the deficiency theorems: several steady states in
// one class, species dying out (siphons), robust concentrations, complex balance for the given
// coefficients. Each verdict in words with the hypotheses it rests on. Presentational.
import type { ReactNode } from "react";
import type { RoomReport } from "~/shared/analysis-map";
import { readableNumberText } from "~/chem/numbers";
import { WitnessDetails, WitnessSearch } from "./witness-search";

type Tone = "ok" | "warn" | "muted";

const toneClasses: Record<Tone, string> = {
  ok: "bg-ok-soft text-ok",
  warn: "bg-signal-soft text-signal",
  muted: "border border-line text-muted",
};

/** Where the mechanism's text is, for the witness search a member may run; without it none is offered. */
export interface WitnessJobTarget {
  mechanismId: string;
  source: () => string;
}

export function BehaviourVerdicts({ report, witnessJob }: { report: RoomReport; witnessJob?: WitnessJobTarget }) {
  // A report stored before these verdicts existed lacks them until the next recompute.
  if (!report.multistationarity || report.reactions.length === 0) return null;
  return (
    <div className="grid gap-3 md:grid-cols-2" data-testid="behaviour-verdicts">
      <Multistationarity report={report} witnessJob={witnessJob} />
      <Persistence report={report} />
      <Robustness report={report} />
      <ComplexBalance report={report} />
    </div>
  );
}

function Card({ title, pill, tone, children }: { title: string; pill: string; tone: Tone; children: ReactNode }) {
  return (
    <article className="rounded-lg border border-line p-3">
      <div className="flex items-center justify-between gap-2">
        <h4 className="text-sm font-semibold">{title}</h4>
        <span className={`pill ${toneClasses[tone]}`}>{pill}</span>
      </div>
      <div className="mt-1.5 space-y-1.5 text-sm leading-relaxed">{children}</div>
    </article>
  );
}

function Multistationarity({ report, witnessJob }: { report: RoomReport; witnessJob?: WitnessJobTarget }) {
  const { verdict, reason, witness } = report.multistationarity;
  const tone: Tone = verdict === "excluded" ? "ok" : verdict === "possible" ? "warn" : "muted";
  return (
    <Card title="Several steady states in one class" pill={verdict} tone={tone}>
      <p data-testid="multistationarity-reason">{reason}</p>
      {witness && <WitnessDetails reactions={report.reactions.map(({ from, to }) => `${report.complexes[from]} → ${report.complexes[to]}`)} witness={witness} />}
      {verdict === "possible" && !witness && witnessJob && <WitnessSearch {...witnessJob} />}
    </Card>
  );
}

function Persistence({ report }: { report: RoomReport }) {
  const { criterionHolds, conclusion } = report.persistence;
  const pill = criterionHolds === null ? "undecided" : criterionHolds ? "persistent" : "criterion fails";
  return (
    <Card title="Can a species die out? (siphons)" pill={pill} tone={criterionHolds === null ? "muted" : criterionHolds ? "ok" : "warn"}>
      {report.siphons && report.siphons.length > 0 && (
        <p>
          Minimal siphons: <span className="font-mono">{report.siphons.map((siphon) => `{${siphon.join(", ")}}`).join(", ")}</span>
        </p>
      )}
      <p>{conclusion}</p>
    </Card>
  );
}

function Robustness({ report }: { report: RoomReport }) {
  const found = report.acr.length > 0;
  return (
    <Card title="Concentrations independent of the totals" pill={found ? report.acr.join(", ") : "none shown"} tone={found ? "ok" : "muted"}>
      <p>{report.robustness.conclusion}</p>
    </Card>
  );
}

function ComplexBalance({ report }: { report: RoomReport }) {
  const balance = report.complexBalance;
  const pill = !balance.applicable ? "not applicable" : balance.satisfied === null ? "coefficients missing" : balance.satisfied ? "holds" : "fails";
  const tone: Tone = !balance.applicable || balance.satisfied === null ? "muted" : balance.satisfied ? "ok" : "warn";
  return (
    <Card title="Complex balance for these coefficients" pill={pill} tone={tone}>
      <p>{balance.note}</p>
      {balance.conditions.length > 0 && (
        <ul className="font-mono text-xs">
          {balance.conditions.map((condition, index) => (
            <li key={index}>
              {condition.text}
              {condition.satisfied === null ? "" : condition.satisfied ? "  (holds)" : "  (fails)"}
            </li>
          ))}
        </ul>
      )}
      {balance.conditions.length > 0 && (
        <p className="text-xs text-muted">
          Tree constants here:{" "}
          {balance.treeConstants.map((value, complex) => `K(${report.complexes[complex]}) = ${value === null ? "?" : readableNumberText(value, 4)}`).join(", ")}
        </p>
      )}
    </Card>
  );
}
