// Live diagnostics in the editor, straight from the shared parser: the messages, offsets and
// severities are exactly what the server and the command line report.
import { type Diagnostic, linter } from "@codemirror/lint";
import { parseMechanism } from "~/chem/parse";

export function mechanismDiagnostics(source: string): Diagnostic[] {
  return parseMechanism(source).diagnostics.map(({ from, to, severity, message }) => ({
    from: Math.min(from, source.length),
    to: Math.min(Math.max(to, from), source.length),
    severity,
    message,
  }));
}

export const mechanismLinter = linter((view) => mechanismDiagnostics(view.state.doc.toString()), { delay: 250 });
