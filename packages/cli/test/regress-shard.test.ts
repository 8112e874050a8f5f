/**
 * `umbra regress` split three ways — shards joined by `umbra merge`, a pool of worker threads, and
 * a resumed run — must write exactly the bytes of one plain run.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { mkdtempSync, readFileSync, rmSync, unlinkSync, writeFileSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { run } from "../src/main.js";

const SCENARIO = {
  name: "shard-check",
  field: { nx: 96, ny: 96, pixelArcmin: 0.75, projection: "TAN", centerDeg: [150, 5], fieldId: "SISKIN-S1" },
  bands: [
    { name: "s090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 8 },
    { name: "s150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 8 },
    { name: "s220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "uK_CMB", noiseUKArcmin: 25 },
  ],
  sky: { cmb: { spectrum: "lcdm2018" }, clusters: { massFunction: { mMinMsun: 1.5e14, mMaxMsun: 2e15, zMin: 0.1, zMax: 1.2 } } },
};

let dir = "";
let scenario = "";

async function quiet(argv: string[]): Promise<number> {
  const e = vi.spyOn(process.stderr, "write").mockImplementation(() => true);
  try {
    return await run(argv);
  } finally {
    e.mockRestore();
  }
}

const common = () => ["--scenario", scenario, "--realisations", "4", "--seed", "20", "--randoms", "20"];
const summary = (d: string) => readFileSync(join(d, "summary.json"), "utf8");

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "umbra-shard-"));
  scenario = join(dir, "scenario.json");
  writeFileSync(scenario, JSON.stringify(SCENARIO));
  expect(await quiet(["regress", ...common(), "--out", join(dir, "single")])).toBe(0);
}, 300_000);

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("umbra regress --shard / merge / --workers / --resume", () => {
  it("a plain run writes every realisation, the summary and the report", () => {
    expect(readdirSync(join(dir, "single", "realisations")).sort()).toEqual(["seed-20.json", "seed-21.json", "seed-22.json", "seed-23.json"]);
    const s = JSON.parse(summary(join(dir, "single"))) as { summary: { realisations: number; seeds: number[] } };
    expect(s.summary.realisations).toBe(4);
    expect(s.summary.seeds).toEqual([20, 21, 22, 23]);
  });

  it("three shards joined by umbra merge give the single run's summary.json byte for byte", async () => {
    for (const i of [1, 2, 3]) expect(await quiet(["regress", ...common(), "--shard", `${i}/3`, "--out", join(dir, `shard${i}`)])).toBe(0);
    expect(await quiet(["merge", "--out", join(dir, "merged"), join(dir, "shard1"), join(dir, "shard2"), join(dir, "shard3")])).toBe(0);
    expect(summary(join(dir, "merged"))).toBe(summary(join(dir, "single")));
  }, 300_000);

  it("merge refuses an incomplete set of shards, naming the missing seeds", async () => {
    expect(await quiet(["merge", "--out", join(dir, "partial"), join(dir, "shard1")])).not.toBe(0);
  });

  it("two worker threads give the same bytes as one thread", async () => {
    expect(await quiet(["regress", ...common(), "--workers", "2", "--out", join(dir, "pool")])).toBe(0);
    expect(summary(join(dir, "pool"))).toBe(summary(join(dir, "single")));
  }, 300_000);

  it("--resume recomputes only the missing realisation and gives the same bytes", async () => {
    const out = join(dir, "single");
    const before = summary(out);
    unlinkSync(join(out, "realisations", "seed-22.json"));
    expect(await quiet(["regress", ...common(), "--resume", "--out", out])).toBe(0);
    expect(summary(out)).toBe(before);
  }, 300_000);
});
