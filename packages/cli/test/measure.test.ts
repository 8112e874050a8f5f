/**
 * `umbra measure`, `umbra search` and `umbra regress` end to end on an invented simulated field
 * written to FITS by @umbra/simulate (the deep-small-field scenario, one fixed seed).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { loadScenario, simulateField, writeSimulatedField } from "../../simulate/src/index.js";
import { capture } from "./capture.js";
import { MEASURE_COLUMNS } from "../src/commands/measure.js";

/** Parse a CSV without quoted fields (what these outputs are) into rows keyed by the header. */
function parse(text: string, _opts: unknown): Record<string, string>[] {
  const lines = text.split("\n").filter((l) => l.length > 0 && !l.startsWith("#"));
  const head = lines[0]!.split(",");
  return lines.slice(1).map((l) => {
    const f = l.split(",");
    return Object.fromEntries(head.map((h, i) => [h, f[i] ?? ""]));
  });
}

const ROOT = fileURLToPath(new URL("../../../", import.meta.url));


describe("umbra measure / search / regress on a simulated field", () => {
  let dir = "";
  let manifest = "";
  let catalog = "";
  let truth: Record<string, string>[] = [];

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), "umbra-measure-"));
    const sc = await loadScenario(join(ROOT, "fixtures/scenarios/deep-small-field.json"));
    const field = simulateField(sc.scenario, 7, sc.cmbTable === undefined ? {} : { cmbTable: sc.cmbTable });
    const w = await writeSimulatedField(field, join(dir, "field"));
    manifest = w.manifestPath;
    truth = parse(readFileSync(w.truthPath, "utf8"), { columns: true, comment: "#" }) as Record<string, string>[];
    // catalogue: true positions; the first cluster without theta500 (size scan), one bad row, one off the map
    const lines = ["id,ra_deg,dec_deg,theta500_arcmin,z,m500_msun"];
    truth.forEach((t, k) => lines.push(`${t.id},${t.ra_deg},${t.dec_deg},${k === 0 ? "" : t.theta500_arcmin},${t.z},${t.m500_msun}`));
    lines.push("BADROW,not-a-number,3,2,,");
    lines.push("FARAWAY,10.0,40.0,2,,");
    catalog = join(dir, "clusters.csv");
    writeFileSync(catalog, `${lines.join("\n")}\n`);
  }, 120_000);

  afterAll(() => {
    if (dir !== "") rmSync(dir, { recursive: true, force: true });
  });

  it("writes the contract columns, measures every good row, flags the off-map one and skips the bad row with a warning", async () => {
    const out = join(dir, "results.csv");
    const r = await capture(["measure", "--bands", manifest, "--catalog", catalog, "--out", out, "--json", "--randoms", "100"]);
    expect(r.code).toBe(0);
    expect(r.err).toContain(`row ${truth.length + 1}`);
    expect(r.err).toContain("row skipped");
    const text = readFileSync(out, "utf8");
    expect(text.split("\n")[0]!.split(",").slice(0, MEASURE_COLUMNS.length)).toEqual([...MEASURE_COLUMNS]);
    const rows = parse(text, { columns: true }) as Record<string, string>[];
    expect(rows.length).toBe(truth.length + 1);
    const far = rows.find((x) => x.id === "FARAWAY")!;
    expect(far.flags).toContain("off_map");
    expect(far.y0).toBe("nan");
    const measured = rows.filter((x) => x.flags === "" || x.flags === "scan_edge");
    expect(measured.length).toBeGreaterThan(truth.length / 2);
    for (const m of measured) {
      expect(Number(m.y0_err)).toBeGreaterThan(0);
      expect(Number(m.snr)).toAllClose(Number(m.y0) / Number(m.y0_err), { rtol: 1e-9 });
    }
    const doc = JSON.parse(readFileSync(join(dir, "results.json"), "utf8")) as {
      provenance: { version: string; inputs: { sha256: string }[] };
      clusters: { id: string; thetaSource: string; scan: unknown[] | null; m500Msun: number | null }[];
    };
    expect(doc.provenance.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(doc.provenance.inputs.every((i) => /^[0-9a-f]{64}$/.test(i.sha256))).toBe(true);
    const first = doc.clusters.find((c) => c.id === truth[0]!.id)!;
    expect(["scan", "mass"]).toContain(first.thetaSource);
  }, 180_000);

  it("runs from the repo root as the pipeline contract says", () => {
    const out = join(dir, "results-npm.csv");
    execFileSync("npm", ["run", "--silent", "umbra", "--", "measure", "--bands", manifest, "--catalog", catalog, "--out", out, "--randoms", "0", "--iterations", "1"], {
      cwd: ROOT,
      stdio: ["ignore", "ignore", "pipe"],
    });
    expect(readFileSync(out, "utf8").startsWith(MEASURE_COLUMNS.join(","))).toBe(true);
  }, 180_000);

  it("exits 2 naming the file when the manifest is missing", async () => {
    const r = await capture(["measure", "--bands", join(dir, "nope.json"), "--catalog", catalog, "--out", join(dir, "x.csv")]);
    expect(r.code).toBe(2);
    expect(r.err).toContain("nope.json");
  });

  it("measures with --method ilc through the same columns", async () => {
    const out = join(dir, "results-ilc.csv");
    const r = await capture(["measure", "--bands", manifest, "--catalog", catalog, "--out", out, "--method", "ilc", "--randoms", "0"]);
    expect(r.code).toBe(0);
    const rows = parse(readFileSync(out, "utf8"), {});
    expect(Object.keys(rows[0]!).slice(0, MEASURE_COLUMNS.length)).toEqual([...MEASURE_COLUMNS]);
    expect(rows.filter((x) => Number.isFinite(Number(x.y0)) && x.y0 !== "nan").length).toBeGreaterThan(truth.length / 2);
  }, 180_000);

  it("rejects an unknown --method with exit 2", async () => {
    const r = await capture(["measure", "--bands", manifest, "--catalog", catalog, "--out", join(dir, "x.csv"), "--method", "psf"]);
    expect(r.code).toBe(2);
    expect(r.err).toContain("--method");
  });

  it("searches blindly, writes raw and debiased S/N and one S/N map per size", async () => {
    const out = join(dir, "cands.csv");
    const maps = join(dir, "snr");
    const r = await capture(["search", "--bands", manifest, "--out", out, "--snr-min", "5", "--sizes", "1,2,4", "--snr-maps", maps]);
    expect(r.code).toBe(0);
    const rows = parse(readFileSync(out, "utf8"), { columns: true }) as Record<string, string>[];
    expect(rows.length).toBeGreaterThan(0);
    for (const c of rows) {
      expect(Number(c.snr)).toBeGreaterThanOrEqual(5);
      expect(Number(c.snr_debiased)).toAllClose(Math.sqrt(Number(c.snr) ** 2 - 3), { rtol: 1e-9 });
    }
    expect(readdirSync(maps).filter((f) => f.endsWith(".fits")).length).toBe(3);
  }, 180_000);

  it("runs a one-sky regression and writes the summary and report", async () => {
    const out = join(dir, "regress");
    const r = await capture(["regress", "--scenario", join(ROOT, "fixtures/scenarios/deep-small-field.json"), "--realisations", "1", "--out", out, "--seed", "3", "--randoms", "50"]);
    expect(r.code).toBe(0);
    const s = JSON.parse(readFileSync(join(out, "summary.json"), "utf8")) as { summary: { realisations: number; pulls: { n: number } } };
    expect(s.summary.realisations).toBe(1);
    expect(s.summary.pulls.n).toBeGreaterThan(5);
    expect(existsSync(join(out, "report", "index.html"))).toBe(true);
    expect(existsSync(join(out, "realisations", "seed-3.json"))).toBe(true);
  }, 180_000);
});
