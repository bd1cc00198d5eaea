import { parseMechanism } from "~/chem/parse";
const src = process.argv[2].replace(/\\n/g, "\n");
const r = parseMechanism(src);
for (const d of r.diagnostics) console.log(`${d.severity} ${d.line}:${d.column} ${d.message}`);
console.log(JSON.stringify(r.mechanism));
