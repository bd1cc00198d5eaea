import { styleTags, tags as t } from "@lezer/highlight";

// Species read as variables, rate coefficients as constants-to-be, labels as names of steps.
export const mechanismHighlighting = styleTags({
  "Species/Name Species/QuotedName": t.variableName,
  "ParameterName/Name": t.constant(t.variableName),
  "FunctionName/Name": t.function(t.variableName),
  "ArithOp/...": t.arithmeticOperator,
  '"(" ")"': t.paren,
  "Label/Name": t.labelName,
  Number: t.number,
  "ForwardArrow ReversibleArrow": t.operator,
  "fixed balanced formula": t.keyword,
  "FormulaText/Name FormulaText/QuotedName": t.string,
  LawText: t.special(t.string),
  Comment: t.lineComment,
  '"@" "=" "+"': t.operator,
  '":" ","': t.separator,
  '"[" "]" InitialClose': t.squareBracket,
  '"{" "}"': t.brace,
  "Zero/Number": t.atom,
  '"∅"': t.atom,
});
