import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { readFitsImage } from "@umbra/maps";
import { capture } from "./capture.js";
import { yMapOptionsFrom } from "../src/commands/ymap.js";


afterEach(() => {
  process.exitCode = undefined;
});

// An invented 4-band field with one massive cluster at the centre, bands in mixed units.
const SCENARIO = {
  name: "ymap-cli",
  field: { nx: 128, ny: 128, pixelArcmin: 0.5, projection: "TAN", centerDeg: [40, -10], fieldId: "YMAPCLI-F1" },
  bands: [
    { name: "b090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 18 },
    { name: "b150", frequencyGHz: 150, beamFwhmArcmin: 1.4, unit: "uK_CMB", noiseUKArcmin: 12 },
    { name: "b220", frequencyGHz: 220, beamFwhmArcmin: 1.0, unit: "K_RJ", noiseUKArcmin: 30 },
    { name: "b350", frequencyGHz: 350, beamFwhmArcmin: 0.8, unit: "MJy/sr", noiseUKArcmin: 150 },
  ],
  sky: { cmb: { spectrum: "lcdm2018" }, clusters: { list: [{ id: "CLI-1", raDeg: 40, decDeg: -10, m500Msun: 8e14, z: 0.3 }], scatterLnY: 0 } },
};

describe("umbra ymap", () => {
  let dir = "";
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), "umbra-ymap-"));
    writeFileSync(join(dir, "scenario.json"), JSON.stringify(SCENARIO));
    const r = await capture(["simulate", "--scenario", join(dir, "scenario.json"), "--seed", "3", "--out", join(dir, "sim")]);
    expect(r.code).toBe(0);
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it("writes the y map (FITS with WCS, beam and provenance), its noise power and the ILC report", async () => {
    const out = join(dir, "y.fits");
    const r = await capture(["ymap", "--bands", join(dir, "sim", "bands.json"), "--out", out, "--ilc", "scale", "--deproject", "cmb", "--json"]);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.out) as {
      effective_fwhm_arcmin: number;
      bias_within_limit: boolean;
      constraints: { component: string; response: number[] }[];
      windows: { bias_fraction: number; weights: Record<string, number> }[];
    };
    expect(JSON.parse(readFileSync(join(dir, "y.ilc.json"), "utf8"))).toEqual(report);
    expect(report.effective_fwhm_arcmin).toBe(2.2);
    expect(report.bias_within_limit).toBe(true);
    const tsz = report.constraints[0]?.response as number[];
    for (const w of report.windows) {
      const ws = ["b090", "b150", "b220", "b350"].map((b) => w.weights[b] as number);
      expect(ws.reduce((s, v, i) => s + v * (tsz[i] as number), 0)).toAllClose(1, { rtol: 1e-10 }); // unit tSZ response
      expect(ws.reduce((s, v) => s + v, 0)).toAllClose(0, { atol: 1e-10 * Math.max(...ws.map(Math.abs)) }); // CMB nulled (K_CMB: response 1)
      expect(w.bias_fraction <= 0.01).toBe(true);
    }
    const img = await readFitsImage(out);
    expect(img.bunit).toBe("Compton-y");
    expect(img.header.get("BEAMFWHM")).toBe(2.2);
    expect(img.header.get("YMAPKIND")).toBe("scale");
    expect(img.header.get("PROVTOOL")).toBe("umbra");
    expect(img.map.wcs?.crval).toEqual([40, -10]);
    // the massive cluster (y0 ≈ 2e-4 before the 2.2′ beam) is the brightest feature at the centre
    let maxV = -Infinity;
    let maxP = -1;
    img.map.data.forEach((v, p) => {
      if (v > maxV) {
        maxV = v;
        maxP = p;
      }
    });
    expect([maxP % 128, Math.floor(maxP / 128)]).toAllClose([63.5, 63.5], { atol: 1.5 });
    const noise = readFileSync(join(dir, "y.noise.csv"), "utf8").trim().split("\n");
    expect(noise[0]).toBe("ell,cl_sr,modes");
    expect(noise.length > 10).toBe(true);
  });

  it("measures the noise power with catalogued clusters cut out when given --catalog", async () => {
    const bands = join(dir, "sim", "bands.json");
    const plain = await capture(["ymap", "--bands", bands, "--out", join(dir, "y1.fits"), "--ilc", "standard"]);
    const cut = await capture(["ymap", "--bands", bands, "--out", join(dir, "y2.fits"), "--ilc", "standard", "--catalog", join(dir, "sim", "truth_clusters.csv")]);
    expect([plain.code, cut.code]).toEqual([0, 0]);
    const read = (f: string) =>
      readFileSync(join(dir, f), "utf8").trim().split("\n").slice(1).map((l) => l.split(",").map(Number) as [number, number, number]);
    const a = read("y1.noise.csv");
    const b = read("y2.noise.csv");
    // the cluster (Y5R500 ≈ 2.8e-3 arcmin²) dominates the y map's power on scales of a few arcmin
    // (ℓ ≈ 1000–3000); cutting it out removes most of that power
    const band = (rows: [number, number, number][]) => rows.filter(([l]) => l > 1000 && l < 3000).reduce((s, [, c]) => s + c, 0);
    expect(band(b) < 0.5 * band(a)).toBe(true);
    const report = JSON.parse(readFileSync(join(dir, "y2.ilc.json"), "utf8")) as { noise_power_note: string; provenance: { inputs: { file: string }[] } };
    expect(report.noise_power_note).toContain("1 catalogued clusters cut out");
    expect(report.provenance.inputs.map((i) => i.file)).toContain("truth_clusters.csv");
  });

  it("rejects bad options with exit code 2 and a one-line reason", async () => {
    const bands = join(dir, "sim", "bands.json");
    const bad = [
      ["--ilc", "fancy"],
      ["--ilc", "standard", "--deproject", "cmb"],
      ["--deproject", "radio"],
      ["--ilc", "constrained", "--ell-windows", "300,600"],
      ["--max-bias", "2"],
    ];
    for (const extra of bad) {
      const r = await capture(["ymap", "--bands", bands, "--out", join(dir, "bad.fits"), ...extra]);
      expect(r.code).toBe(2);
      expect(r.err.trim().split("\n").length).toBe(1);
    }
    const missing = await capture(["ymap", "--bands", join(dir, "nope.json"), "--out", join(dir, "bad.fits")]);
    expect(missing.code).toBe(2);
  });

  it("maps options onto buildYMap settings with the documented defaults", () => {
    const o = yMapOptionsFrom({ ilc: "constrained", dustBeta: "1.6", dustTemp: "19.6", transition: "0.5", maxBias: "0.01", deproject: "cmb,dust" });
    expect(o).toEqual({ ilc: "constrained", transitionFraction: 0.5, maxBiasFraction: 0.01, dust: { beta: 1.6, temperatureK: 19.6, refFrequencyGHz: 353 }, deproject: ["cmb", "dust"] });
  });
});
