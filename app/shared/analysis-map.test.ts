import * as Y from "yjs";
import { describe, expect, it } from "vitest";
import { analyzeMechanism, parseForAnalysis } from "~/chem/analysis";
import type { RoomAnalysis } from "./analysis-map";
import { analysisEntries, pack } from "../../server/collab/analysis-entries";
import { type RoomEquations, roomAnalysisReader, unpack, unpackNatively, watchRoomAnalysis, watchRoomEquations } from "./analysis-map";

const reportOf = async (source: string) => analyzeMechanism(parseForAnalysis(source));

describe("the room's analysis map", () => {
  it("packs a report into far fewer bytes than its text, and back unchanged", async () => {
    const source = Array.from({ length: 60 }, (_, i) => `S${i} + E <=> C${i} @ ${i + 1}, 0.5\nC${i} -> P${i} + E @ 2\n`).join("");
    const report = await reportOf(source);
    const packed = pack(report);
    expect(packed.byteLength).toBeLessThan(JSON.stringify(report).length / 3);
    expect(unpack(packed)).toEqual(report);
    expect(pack(report)).toEqual(packed);
  });

  it("reads the counts and unpacks the report only when it changed", async () => {
    const map = new Y.Doc().getMap("analysis");
    const read = roomAnalysisReader();
    expect(read(map).report).toBeUndefined();

    map.set("deficiency", 0);
    map.set("report", pack(await reportOf("A + B -> C @ 1\n")));
    const first = read(map);
    expect(first.deficiency).toBe(0);
    expect(first.report?.complexes).toEqual(["A + B", "C"]);
    map.set("revision", 2);
    expect(read(map).report).toBe(first.report);

    map.set("report", pack(await reportOf("A -> B @ 1\nB -> A @ 2\n")));
    expect(read(map).report?.reversible).toBe(true);

    map.set("report", new Uint8Array([1, 2, 3]));
    expect(read(map).report).toBeUndefined();
  });

  it("unpacks with the platform's inflate to the same report", async () => {
    const report = await reportOf("A + B <=> C @ 1, 2\nC -> D @ 3\n");
    expect(await unpackNatively(pack(report))).toEqual(report);
    await expect(unpackNatively(new Uint8Array([1, 2, 3]))).rejects.toThrow();
  });

  it("watches the map: counts with their report, one unpack per report, overtaken reads dropped", async () => {
    const doc = new Y.Doc();
    const map = doc.getMap("analysis");
    const reads: RoomAnalysis[] = [];
    const stop = watchRoomAnalysis(map, (analysis) => reads.push(analysis));
    expect(reads).toEqual([{}]);

    const first = await reportOf("A + B -> C @ 1\n");
    doc.transact(() => {
      map.set("revision", 1);
      map.set("report", pack(first));
    });
    await expect.poll(() => reads.length).toBe(2);
    expect(reads[1]).toEqual({ revision: 1, report: first });

    // A change of counts alone keeps the unpacked report object.
    map.set("revision", 2);
    expect(reads[2].revision).toBe(2);
    expect(reads[2].report).toBe(reads[1].report);

    // Two reports in quick succession: only the newer one is shown.
    const second = await reportOf("A -> B @ 1\n");
    const third = await reportOf("A -> B @ 1\nB -> A @ 2\n");
    doc.transact(() => {
      map.set("revision", 3);
      map.set("report", pack(second));
    });
    doc.transact(() => {
      map.set("revision", 4);
      map.set("report", pack(third));
    });
    await expect.poll(() => reads.at(-1)?.revision).toBe(4);
    expect(reads.slice(3)).toEqual([{ revision: 4, report: third }]);

    map.set("report", new Uint8Array([1, 2, 3]));
    await expect.poll(() => reads.length).toBe(5);
    expect(reads[4]).toEqual({ revision: 4 });

    stop();
    map.set("revision", 5);
    expect(reads.length).toBe(5);
  });

  it("sends the equations apart from the report, and unpacks them only for a reader who watches them", async () => {
    const report = await reportOf("A + B <=> C @ k1, 2\nk1 = 3e9\n");
    const { report: packedReport, equations: packedEquations } = analysisEntries(report);
    const { odes, odesLatex, ...rest } = report;
    expect(unpack(packedReport)).toEqual(rest);
    expect(unpack(packedEquations)).toEqual({ odes, odesLatex });

    const doc = new Y.Doc();
    const map = doc.getMap("analysis");
    const reads: (RoomEquations | null)[] = [];
    const stop = watchRoomEquations(map, (equations) => reads.push(equations));
    expect(reads).toEqual([null]);
    doc.transact(() => {
      map.set("report", packedReport);
      map.set("equations", packedEquations);
    });
    await expect.poll(() => reads.length).toBe(2);
    expect(reads[1]).toEqual({ odes, odesLatex });
    // Other keys changing leave the equations alone.
    map.set("revision", 7);
    map.set("report", pack(rest));
    expect(reads.length).toBe(2);
    stop();
    map.set("equations", pack({ odes: {}, odesLatex: {} }));
    expect(reads.length).toBe(2);
  });

  it("never counts the packed equations among the counts", async () => {
    const map = new Y.Doc().getMap("analysis");
    const { report, equations } = analysisEntries(await reportOf("A -> B @ 1\n"));
    map.set("deficiency", 0);
    map.set("report", report);
    map.set("equations", equations);
    expect(Object.keys(roomAnalysisReader()(map)).sort()).toEqual(["deficiency", "report"]);
  });
});
