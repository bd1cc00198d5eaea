import { readdirSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { fileTests } from "@lezer/generator/test";
import { describe, it } from "vitest";
import { parser } from "../parser";

// Each `.txt` file beside this one holds the expected trees for one construct of the language.
const folder = fileURLToPath(new URL(".", import.meta.url));

for (const file of readdirSync(folder).filter((name) => name.endsWith(".txt"))) {
  describe(file, () => {
    for (const { name, run } of fileTests(readFileSync(folder + file, "utf8"), file)) {
      it(name, () => run(parser));
    }
  });
}
