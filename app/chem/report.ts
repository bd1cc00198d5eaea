// The structure report as plain text for a terminal: what a chemist reads after `analyze FILE`.
import type { AnalysisReport } from "./analysis";
import { combinationText } from "./expression";

export function formatReport(report: AnalysisReport): string {
  const { species, complexes, reactions } = report;
  const complexList = (members: number[]) => members.map((index) => complexes[index]).join(", ");
  const rate = (value: number | null) => (value === null ? "" : `  (rate ${value})`);
  const yesNo = (value: boolean) => (value ? "yes" : "no");
  const lines: string[] = [];
  const section = (title: string, body: string[]) => {
    if (body.length > 0) lines.push("", title, ...body.map((line) => `  ${line}`));
  };

  lines.push(
    `${count(species.length, "species", "species")}, ${count(complexes.length, "complex", "complexes")}, ` +
      `${count(reactions.length, "reaction", "reactions")}, ${count(report.linkageClasses.length, "linkage class", "linkage classes")}`,
    `Rank ${report.rank}, deficiency ${report.deficiency}; reversible: ${yesNo(report.reversible)}, weakly reversible: ${yesNo(report.weaklyReversible)}`,
  );
  section("Diagnostics", report.diagnostics.map((d) => `${d.line}:${d.column} ${d.severity}: ${d.message}`));
  if (Object.keys(report.fixedSpecies).length > 0) {
    section("Fixed species", Object.entries(report.fixedSpecies).map(([name, value]) => `${name} = ${value}`));
  }
  section("Reactions", reactions.map((reaction, index) => `${index + 1}. ${complexes[reaction.from]} -> ${complexes[reaction.to]}${rate(reaction.rate)}`));
  const terminal = new Set(report.terminalStrongLinkageClasses.map((members) => members[0]));
  section(
    "Linkage classes",
    report.linkageClasses.map((members, index) => `${index + 1}. ${complexList(members)}  (deficiency ${report.linkageClassDeficiencies[index]})`),
  );
  section(
    "Strong linkage classes",
    report.strongLinkageClasses.map((members) => `{${complexList(members)}}${terminal.has(members[0]) ? "  terminal" : ""}`),
  );
  section("Conservation laws", [
    ...report.conservationLaws.map((law) => `${combinationText(law, species)} = constant`),
    report.massConserving ? "Some conservation law weighs every species positively: mass is conserved." : "No conservation law weighs every species positively.",
  ]);
  section("Deficiency Zero Theorem", [report.theorems.deficiencyZero.conclusion]);
  section("Deficiency One Theorem", [report.theorems.deficiencyOne.conclusion]);
  const { verdict, reason, witness } = report.multistationarity;
  section(`Several steady states in one class: ${verdict}`, [
    reason,
    ...(witness
      ? [
          `Witness rate coefficients: ${witness.rates.map((rate, r) => `${r + 1}. ${rate}`).join(", ")}`,
          ...witness.equilibria.map((state, k) => `Steady state ${k + 1}: ${Object.entries(state).map(([name, value]) => `${name} = ${value}`).join(", ")}`),
        ]
      : []),
  ]);
  section("Siphons and persistence", [
    ...(report.siphons && report.siphons.length > 0 ? [`Minimal siphons: ${report.siphons.map((siphon) => `{${siphon.join(", ")}}`).join(", ")}`] : []),
    report.persistence.conclusion,
  ]);
  section("Absolute concentration robustness", [report.robustness.conclusion]);
  section("Complex balance", [
    report.complexBalance.note,
    ...report.complexBalance.conditions.map(({ text, satisfied }) => `${text}${satisfied === null ? "" : satisfied ? "  (holds)" : "  (fails)"}`),
  ]);
  section("Induced kinetic differential equations", species.map((name) => `d${name}/dt = ${report.odes[name]}`));
  section(
    "Custom rate laws (not mass action)",
    report.customLaws.map(({ reaction, law, lines: at }) => `${complexes[reactions[reaction].from]} -> ${complexes[reactions[reaction].to]}: ${law}  (line ${at.join(", ")})`),
  );
  const balance = report.detailedBalance;
  section("Detailed balance", [
    balance.note,
    ...[...balance.circuitConditions, ...balance.spanningForestConditions].map(
      (condition) => `${condition.text}${condition.satisfied === null ? "" : condition.satisfied ? "  (holds)" : "  (fails)"}`,
    ),
  ]);
  return lines.join("\n") + "\n";
}

function count(value: number, one: string, many: string): string {
  return `${value} ${value === 1 ? one : many}`;
}
