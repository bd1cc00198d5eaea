import * as Y from "yjs";
import { describe, expect, it } from "vitest";
import { analyzeMechanism, parseForAnalysis } from "~/chem/analysis";
import { packReport, roomAnalysisReader, unpackReport } from "./analysis-map";

const reportOf = async (source: string) => analyzeMechanism(parseForAnalysis(source));

describe("the room's analysis map", () => {
  it("packs a report into far fewer bytes than its text, and back unchanged", async () => {
    const source = Array.from({ length: 60 }, (_, i) => `S${i} + E <=> C${i} @ ${i + 1}, 0.5\nC${i} -> P${i} + E @ 2\n`).join("");
    const report = await reportOf(source);
    const packed = packReport(report);
    expect(packed.byteLength).toBeLessThan(JSON.stringify(report).length / 3);
    expect(unpackReport(packed)).toEqual(report);
    expect(packReport(report)).toEqual(packed);
  });

  it("reads the counts and unpacks the report only when it changed", async () => {
    const map = new Y.Doc().getMap("analysis");
    const read = roomAnalysisReader();
    expect(read(map).report).toBeUndefined();

    map.set("deficiency", 0);
    map.set("report", packReport(await reportOf("A + B -> C @ 1\n")));
    const first = read(map);
    expect(first.deficiency).toBe(0);
    expect(first.report?.complexes).toEqual(["A + B", "C"]);
    map.set("revision", 2);
    expect(read(map).report).toBe(first.report);

    map.set("report", packReport(await reportOf("A -> B @ 1\nB -> A @ 2\n")));
    expect(read(map).report?.reversible).toBe(true);

    map.set("report", new Uint8Array([1, 2, 3]));
    expect(read(map).report).toBeUndefined();
  });
});
