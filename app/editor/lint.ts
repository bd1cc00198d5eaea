// Live diagnostics in the editor, straight from the shared parser: the messages, offsets and
// severities are exactly what the server and the command line report. The text is read in the
// reading worker, so a long mechanism never stalls typing.
import { linter } from "@codemirror/lint";
import { readMechanismText } from "./text-reader";

export const mechanismLinter = linter((view) => readMechanismText("diagnostics", view.state.doc.toString()), { delay: 250 });
