/**
 * `umbra measure` and `umbra search` over sky tiles: shards joined by `umbra merge`, a pool of
 * worker threads and a resumed run must write exactly the bytes of one tiled run; missing tiles,
 * foreign tile files and tile options without --tile are refused (exit 2) with the reason. Without
 * tiles, `--workers` spreads the matched-filter fits over threads: same bytes as one thread.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, statSync, unlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { execFileSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { loadScenario, simulateField, writeSimulatedField } from "../../simulate/src/index.js";
import { capture } from "./capture.js";

/** Invented field: 2° × 2° at 0.75′, three bands, clusters from the mass function. */
const SCENARIO = {
  name: "tile-check",
  field: { nx: 160, ny: 160, pixelArcmin: 0.75, projection: "TAN", centerDeg: [210, -10], fieldId: "WAXWING-T1" },
  bands: [
    { name: "w090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 6 },
    { name: "w150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 6 },
    { name: "w220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "uK_CMB", noiseUKArcmin: 20 },
  ],
  sky: { cmb: { spectrum: "lcdm2018" }, clusters: { massFunction: { mMinMsun: 2e14, mMaxMsun: 2e15, zMin: 0.1, zMax: 1.0 } } },
};

let dir = "";
let manifest = "";
let catalog = "";
const read = (p: string) => readFileSync(p, "utf8");

const measureArgs = () => ["measure", "--bands", manifest, "--catalog", catalog, "--no-relativistic", "--randoms", "20", "--iterations", "1", "--tile", "1", "--tile-margin", "15"];
const searchArgs = () => ["search", "--bands", manifest, "--sizes", "1,2,4", "--iterations", "1", "--tile", "1", "--tile-margin", "15"];

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "umbra-tiles-"));
  const scenario = join(dir, "scenario.json");
  writeFileSync(scenario, JSON.stringify(SCENARIO));
  const sc = await loadScenario(scenario);
  const w = await writeSimulatedField(simulateField(sc.scenario, 3, sc.cmbTable === undefined ? {} : { cmbTable: sc.cmbTable }), join(dir, "field"));
  manifest = w.manifestPath;
  catalog = w.truthPath;
}, 120_000);

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("umbra measure --tile: shards, merge, workers, resume", () => {
  let single = "";
  beforeAll(async () => {
    single = join(dir, "m-single", "results.csv");
    const r = await capture([...measureArgs(), "--out", single, "--json"]);
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
  }, 120_000);

  it("measures every catalogue row once, in catalogue order", () => {
    const ids = read(single).trim().split("\n").slice(1).map((l) => l.split(",")[0]);
    const truthIds = read(catalog).split("\n").filter((l) => l.length > 0 && !l.startsWith("#")).slice(1).map((l) => l.split(",")[0]);
    expect(truthIds.length).toBeGreaterThan(3);
    expect(ids).toEqual(truthIds);
    expect(JSON.parse(read(join(dir, "m-single", "results.json"))).diagnostics.tiles.length).toBe(4);
  });

  it("two shards in separate folders joined by umbra merge give the same bytes (CSV and JSON)", async () => {
    const a = join(dir, "m-a", "results.csv");
    const b = join(dir, "m-b", "results.csv");
    expect((await capture([...measureArgs(), "--out", a, "--shard", "1/2"])).code).toBe(0);
    const rb = await capture([...measureArgs(), "--out", b, "--shard", "2/2"]);
    expect(rb.code).toBe(0);
    expect(rb.err).toContain("shard 2/2: tiles 2–3");
    const merged = join(dir, "m-merged.csv");
    expect((await capture(["merge", "--json", "--out", merged, join(dir, "m-a", "results.tiles"), join(dir, "m-b", "results.tiles")])).code).toBe(0);
    expect(read(merged)).toBe(read(single));
    expect(read(join(dir, "m-merged.json"))).toBe(read(join(dir, "m-single", "results.json")));
    // one shard's folder alone is not a whole run
    const partial = await capture(["merge", "--out", join(dir, "m-partial.csv"), join(dir, "m-a", "results.tiles")]);
    expect(partial.code).toBe(2);
    expect(partial.err).toContain("tiles 2, 3 of 4 are missing");
  }, 120_000);

  it("two worker threads give the same bytes", async () => {
    const out = join(dir, "m-workers", "results.csv");
    expect((await capture([...measureArgs(), "--out", out, "--json", "--workers", "2"])).code).toBe(0);
    expect(read(out)).toBe(read(single));
    expect(read(join(dir, "m-workers", "results.json"))).toBe(read(join(dir, "m-single", "results.json")));
  }, 120_000);

  it("--resume recomputes only the missing tile and gives the same bytes; a tile of another run is refused", async () => {
    const tiles = join(dir, "m-single", "results.tiles");
    const keep = statSync(join(tiles, "tile-0000.json")).mtimeMs;
    unlinkSync(join(tiles, "tile-0002.json"));
    const before = read(single);
    const r = await capture([...measureArgs(), "--out", single, "--resume"]);
    expect(r.code).toBe(0);
    expect(statSync(join(tiles, "tile-0000.json")).mtimeMs).toBe(keep);
    expect(read(single)).toBe(before);
    const other = await capture([...measureArgs(), "--seed", "2", "--out", single, "--resume"]);
    expect(other.code).toBe(2);
    expect(other.err).toContain("tile 0 of another run");
  }, 120_000);

  it("rerun with another tile size into the same folder: the earlier run's tile files are ignored", async () => {
    const out = join(dir, "m-rerun", "results.csv");
    expect((await capture([...measureArgs(), "--out", out])).code).toBe(0);
    const coarse = measureArgs().map((a, i, all) => (all[i - 1] === "--tile" ? "3" : a));
    const r = await capture([...coarse, "--out", out, "--json"]);
    expect(r.code).toBe(0);
    expect(JSON.parse(read(join(dir, "m-rerun", "results.json"))).diagnostics.tiles.length).toBe(1);
  }, 120_000);

    it("refuses --shard or --resume without --tile, and a margin narrower than the taper", async () => {
    const base = ["measure", "--bands", manifest, "--catalog", catalog, "--out", join(dir, "x.csv")];
    for (const extra of [["--shard", "1/2"], ["--resume"]]) {
      const r = await capture([...base, ...extra]);
      expect(r.code).toBe(2);
      expect(r.err).toContain("give --tile DEG too");
    }
    const m = await capture([...base, "--tile", "1", "--tile-margin", "5"]);
    expect(m.code).toBe(2);
    expect(m.err).toContain("narrower than the 8-arcmin edge taper");
  });
});

describe("umbra measure / search --workers without tiles (fit threads)", () => {
  it("write the bytes of a one-thread run", async () => {
    const one = join(dir, "fit1.csv");
    const two = join(dir, "fit2.csv");
    const m = ["measure", "--bands", manifest, "--catalog", catalog, "--no-relativistic", "--randoms", "20", "--iterations", "1"];
    expect((await capture([...m, "--out", one])).code).toBe(0);
    expect((await capture([...m, "--out", two, "--workers", "2"])).code).toBe(0);
    expect(read(two)).toBe(read(one));
    const s = ["search", "--bands", manifest, "--sizes", "1,2,4", "--iterations", "1"];
    expect((await capture([...s, "--out", join(dir, "sfit1.csv")])).code).toBe(0);
    expect((await capture([...s, "--out", join(dir, "sfit2.csv"), "--workers", "2"])).code).toBe(0);
    expect(read(join(dir, "sfit2.csv"))).toBe(read(join(dir, "sfit1.csv")));
  }, 120_000);
});

describe("umbra search --tile: shards in one folder, merge", () => {
  it("three shards writing into one tile folder, joined by umbra merge, give the bytes of one tiled run", async () => {
    const single = join(dir, "s-single", "cands.csv");
    expect((await capture([...searchArgs(), "--out", single, "--json"])).code).toBe(0);
    const shared = join(dir, "s-shared", "cands.csv");
    for (const s of ["1/3", "2/3", "3/3"]) expect((await capture([...searchArgs(), "--out", shared, "--shard", s])).code).toBe(0);
    const merged = join(dir, "s-merged.csv");
    expect((await capture(["merge", "--json", "--out", merged, join(dir, "s-shared", "cands.tiles")])).code).toBe(0);
    expect(read(merged)).toBe(read(single));
    expect(read(join(dir, "s-merged.json"))).toBe(read(join(dir, "s-single", "cands.json")));
    expect(read(single).trim().split("\n").length).toBeGreaterThan(1);
  }, 120_000);
});

describe("docs/hpc/measure-tiles-slurm.sh", () => {
  it("runs as two array tasks and a merge job, measuring every catalogue row", () => {
    const root = fileURLToPath(new URL("../../../", import.meta.url));
    const out = join(dir, "slurm", "results.csv");
    const env = { ...process.env, BANDS: manifest, CATALOG: catalog, TILE_DEG: "1", SHARDS: "2", OUT: out, SLURM_CPUS_PER_TASK: "1" };
    for (const task of ["1", "2"]) execFileSync("bash", ["docs/hpc/measure-tiles-slurm.sh"], { cwd: root, env: { ...env, SLURM_ARRAY_TASK_ID: task }, stdio: "pipe" });
    execFileSync("bash", ["docs/hpc/measure-tiles-slurm.sh", "merge"], { cwd: root, env, stdio: "pipe" });
    const rows = read(out).trim().split("\n").length - 1;
    const truthRows = read(catalog).split("\n").filter((l) => l.length > 0 && !l.startsWith("#")).length - 1;
    expect(rows).toBe(truthRows);
    expect(JSON.parse(read(join(dir, "slurm", "results.json"))).diagnostics.tiles.length).toBe(4);
  }, 180_000);
});
