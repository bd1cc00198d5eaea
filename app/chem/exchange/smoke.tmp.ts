import { readFileSync } from "node:fs";
import { importSbml } from "./sbml-import";
import { checkSbml } from "./sbml-check";
for (const f of ["michaelis-menten", "lotka-volterra", "brusselator", "michaelis-menten-rate-law"]) {
  const xml = readFileSync(`tests/fixtures/sbml/${f}.xml`, "utf8");
  console.log(f, checkSbml(xml));
  const r = importSbml(xml);
  console.log("source" in r ? r.source + "\n" + r.warnings.join("\n") : r);
}
