/**
 * Writing a simulated field: FITS conformance (astropy 5.2.1 verified a band file as the simulator
 * writes it, with warnings as errors: fixtures/simulate/tiny_sim_astropy.json), round trips through the maps package's
 * readers, and byte-identical output for the same seed.
 */
import { mkdtempSync, readFileSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadBandManifest, pixelToWorld, readClusterCatalog, readFitsImage } from "@umbra/maps";
import { parseScenario, simulateField, writeSimulatedField } from "../src/index.js";
import { tinyData, tinyFitsBytes, tinyWcs } from "../../../fixtures/simulate/tiny_fits_spec.js";

const fixture = (name: string): string => fileURLToPath(new URL(`../../../fixtures/simulate/${name}`, import.meta.url));

interface AstropyView {
  data: number[];
  header: Record<string, string | number>;
  pixels0: [number, number][];
  world: [number, number][];
}

describe("FITS output", () => {
  it("reproduces the committed file astropy verified, byte for byte", () => {
    expect(Buffer.from(tinyFitsBytes()).equals(readFileSync(fixture("tiny_sim.fits")))).toBe(true);
  });
  it("wrote values, header and WCS that astropy reads back as intended", () => {
    const a = JSON.parse(readFileSync(fixture("tiny_sim_astropy.json"), "utf8")) as AstropyView;
    expect(a.data).toAllClose(tinyData(), { rtol: 0 });
    expect(a.header).toMatchObject({ BUNIT: "uK_CMB", BEAMFWHM: 1.4, SIMSEED: 7, FREQGHZ: 150, BANDNAME: "f150", OBJECT: "O'TINY", PROVTOOL: "umbra simulate" });
    // astropy.wcs all_pix2world (0-based) vs the maps package's transform of the WCS we wrote
    a.pixels0.forEach(([x, y], i) => {
      const w = pixelToWorld(tinyWcs, x, y);
      expect([w.lonDeg, w.latDeg]).toAllClose(a.world[i]!, { rtol: 1e-12 });
    });
  });
});

describe("writeSimulatedField", () => {
  const scen = parseScenario(JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/scenarios/wide-shallow-survey.json", import.meta.url)), "utf8")), "wide");
  // shrink the wide survey for test speed, keeping its six units, depth, radio and clusters
  const small = parseScenario({ ...JSON.parse(JSON.stringify(scen)), field: { ...scen.field, nx: 128, ny: 128 } }, "wide-small");

  it("writes maps, ivar maps, manifest, truth and provenance that the maps readers accept", async () => {
    const dir = mkdtempSync(join(tmpdir(), "umbra-sim-"));
    const f = simulateField(small, 3);
    const w = await writeSimulatedField(f, dir);
    const m = await loadBandManifest(w.manifestPath);
    expect(m.manifest.bands.map((b) => b.name)).toEqual(small.bands.map((b) => b.name));
    const img = await readFitsImage(join(dir, "f225.fits"));
    expect(img.map.data).toAllClose(f.bands[4]!.map, { rtol: 0 });
    expect(img.map.unit).toBe("MJy/sr");
    const w0 = pixelToWorld(img.map.wcs!, 10, 20);
    const w1 = pixelToWorld(f.wcs, 10, 20);
    expect([w0.lonDeg, w0.latDeg]).toAllClose([w1.lonDeg, w1.latDeg], { rtol: 1e-14 });
    const ivar = await readFitsImage(join(dir, "f225_ivar.fits"));
    expect(ivar.map.data).toAllClose(f.bands[4]!.ivar!, { rtol: 0 });
    const truth = await readClusterCatalog(w.truthPath);
    expect(truth.rows.length).toBe(f.clusters.length);
    if (f.clusters.length > 0) expect(Number(truth.rows[0]!.extra.y5r500_arcmin2)).toBe(f.clusters[0]!.y5r500Arcmin2);
    const prov = JSON.parse(readFileSync(w.provenancePath, "utf8"));
    expect(prov.seed).toBe(3);
    expect(prov.scenario.name).toBe("wide-shallow-survey");
    expect(Object.keys(prov.files).length).toBe(w.files.length - 1);
  });
  it("gives the same bytes for the same seed and different bytes for another seed", async () => {
    const a = mkdtempSync(join(tmpdir(), "umbra-sim-a-"));
    const b = mkdtempSync(join(tmpdir(), "umbra-sim-b-"));
    const c = mkdtempSync(join(tmpdir(), "umbra-sim-c-"));
    await writeSimulatedField(simulateField(small, 11), a);
    await writeSimulatedField(simulateField(small, 11), b);
    await writeSimulatedField(simulateField(small, 12), c);
    const names = readdirSync(a).sort();
    expect(names).toEqual(readdirSync(b).sort());
    for (const n of names) expect(readFileSync(join(a, n)).equals(readFileSync(join(b, n)))).toBe(true);
    expect(readFileSync(join(a, "f145.fits")).equals(readFileSync(join(c, "f145.fits")))).toBe(false);
  });
});
