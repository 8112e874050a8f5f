import { mkdtemp, readFile, readdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { parseClusterCatalog, readClusterCatalog, toCsv, writeClusterCatalog, writeCsvAtomic } from "../src/catalog/index.js";

const fixture = fileURLToPath(new URL("../../../fixtures/catalog/clusters_invented.csv", import.meta.url));
let dir = "";
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "umbra-catalog-"));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe("readClusterCatalog", () => {
  it("reads good rows, keeps extra columns and skips each bad row with a problem naming row, line and column", async () => {
    const { rows, problems, extraColumns } = await readClusterCatalog(fixture);
    expect(rows.map((r) => r.id)).toEqual(["UMB-X001", "UMB-X002", "UMB-X006", "UMB-X009"]);
    expect(extraColumns).toEqual(["field_tag"]);
    const first = rows[0];
    expect([first?.raDeg, first?.decDeg, first?.theta500Arcmin, first?.z, first?.m500Msun, first?.teKeV]).toEqual([150.1, 2.2, 4.5, 0.35, 4.2e14, 5.1]);
    expect(rows[1]?.extra).toEqual({ field_tag: "wide, south" });
    expect([rows[1]?.theta500Arcmin, rows[1]?.m500Msun, rows[1]?.teKeV]).toEqual([null, null, null]);
    expect([rows[2]?.theta500Arcmin, rows[2]?.teKeV]).toEqual([null, null]);
    expect(rows[3]?.raDeg).toBe(350); // −10° wrapped into [0, 360)
    expect(problems.map((p) => [p.row, p.line, p.column])).toEqual([
      [3, 6, "ra_deg"],
      [4, 7, "dec_deg"],
      [5, 8, "m500_msun"],
      [7, 10, "id"],
      [8, 11, "(row)"],
    ]);
  });

  it("fails with BAD_CATALOG naming the column when a required column is missing", () => {
    try {
      parseClusterCatalog("id,ra_deg,z\nA,1,0.1\n", "cat.csv");
      expect.unreachable();
    } catch (e) {
      expect(isUmbraError(e, "BAD_CATALOG")).toBe(true);
      if (isUmbraError(e)) expect(e.place).toMatchObject({ file: "cat.csv", field: "dec_deg" });
    }
  });

  it("fails with BAD_CATALOG on an empty file and a repeated column, NOT_FOUND on a missing file", async () => {
    expect(() => parseClusterCatalog("# only a comment\n\n")).toThrow(/header line is required/);
    expect(() => parseClusterCatalog("id,ra_deg,dec_deg,ra_deg\n")).toThrow(/appears twice/);
    await expect(readClusterCatalog(join(dir, "nope.csv"))).rejects.toMatchObject({ code: "NOT_FOUND" });
  });
});

describe("writeCsvAtomic / writeClusterCatalog", () => {
  it("writes numbers with shortest round-trip precision and NaN as nan", () => {
    const text = toCsv(["a", "b", "c", "d"], [{ a: 0.1 + 0.2, b: NaN, c: -Infinity, d: null }, { a: 1e-300, b: "x,y", c: 5, d: undefined }]);
    expect(text).toBe('a,b,c,d\n0.30000000000000004,nan,-inf,\n1e-300,"x,y",5,\n');
  });

  it("round-trips any finite double exactly (property test; ECMA-262 Number::toString is shortest round-trip)", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 1, maxLength: 20 }), (xs) => {
        const text = toCsv(["x"], xs.map((x) => ({ x })));
        const back = text.trim().split("\n").slice(1).map(Number);
        expect(back.map((v, i) => Object.is(v, xs[i]) || (v === 0 && xs[i] === 0))).toEqual(xs.map(() => true));
      }),
      { numRuns: 200 },
    );
  });

  it("writes a catalogue that reads back identically, atomically (no temp file left)", async () => {
    const { rows } = await readClusterCatalog(fixture);
    const out = join(dir, "copy.csv");
    await writeClusterCatalog(out, rows, ["field_tag"]);
    const again = await readClusterCatalog(out);
    expect(again.rows).toEqual(rows);
    expect(again.problems).toEqual([]);
    await writeCsvAtomic(out, ["id"], [{ id: "only" }]);
    expect(await readFile(out, "utf8")).toBe("id\nonly\n");
    expect((await readdir(dir)).filter((f) => f.endsWith(".tmp"))).toEqual([]);
    await expect(writeCsvAtomic(join(dir, "no-such-folder", "x.csv"), ["id"], [])).rejects.toMatchObject({ code: "NOT_FOUND" });
    await writeFile(join(dir, "x.csv"), "id,ra_deg,dec_deg\n");
    expect((await readClusterCatalog(join(dir, "x.csv"))).rows).toEqual([]);
  });
});
