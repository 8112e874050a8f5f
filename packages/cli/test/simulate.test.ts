/** `umbra simulate`: writes a reproducible field from a scenario file; bad input exits 2 with one line. */
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { run } from "../src/main.js";
import { captureOutputEachTest } from "./capture.js";

const io = captureOutputEachTest();

const dir = mkdtempSync(join(tmpdir(), "umbra-cli-sim-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const scenario = {
  name: "cli-test",
  field: { nx: 64, ny: 64, pixelArcmin: 1, projection: "TAN", centerDeg: [10, -10], fieldId: "CLI-TEST" },
  bands: [
    { name: "f090", frequencyGHz: 90, beamFwhmArcmin: 2.2, unit: "uK_CMB", noiseUKArcmin: 20 },
    { name: "f150", bandpass: { frequencyGHz: [130, 150, 170], weight: [0.5, 1, 0.5] }, beamFwhmArcmin: 1.4, unit: "K_RJ", noiseUKArcmin: 20 },
  ],
  sky: {
    cmb: { table: "cl.txt", column: "dell_uK2" },
    clusters: { list: [{ id: "CLI-C1", raDeg: 10, decDeg: -10, m500Msun: 5e14, z: 0.3 }] },
  },
};
writeFileSync(join(dir, "scenario.json"), JSON.stringify(scenario));
writeFileSync(join(dir, "cl.txt"), "# L D_ell\n2 1000\n1000 2000\n4000 100\n20000 1\n");

describe("umbra simulate", () => {
  it("writes maps, manifest, truth and provenance, and says so", async () => {
    const outDir = join(dir, "a");
    expect(await run(["simulate", "--scenario", join(dir, "scenario.json"), "--seed", "5", "--out", outDir])).toBe(0);
    expect(io.out).toContain("simulated 'cli-test' seed 5");
    const files = readdirSync(outDir).sort();
    expect(files).toEqual(["bands.json", "f090.fits", "f090_ivar.fits", "f150.fits", "f150_bandpass.txt", "f150_ivar.fits", "provenance.json", "truth_clusters.csv", "truth_radio.csv"]);
    const manifest = JSON.parse(readFileSync(join(outDir, "bands.json"), "utf8"));
    expect(manifest.bands[1]).toMatchObject({ name: "f150", map: "f150.fits", bandpass: "f150_bandpass.txt", unit: "K_RJ", ivar: "f150_ivar.fits" });
    expect(readFileSync(join(outDir, "truth_clusters.csv"), "utf8").split("\n")[1]).toMatch(/^CLI-C1,10,-10,/);
    // relativistic tSZ by default: measuring with the truth catalogue's te_kev is consistent, no note
    expect(io.err).not.toMatch(/painted non-relativistic/);
  });
  it("tells how to measure a sky painted non-relativistic", async () => {
    const flat = { ...scenario, sky: { ...scenario.sky, clusters: { ...scenario.sky.clusters, relativistic: false } } };
    writeFileSync(join(dir, "scenario-nonrel.json"), JSON.stringify(flat));
    expect(await run(["simulate", "--scenario", join(dir, "scenario-nonrel.json"), "--seed", "5", "--out", join(dir, "nonrel")])).toBe(0);
    // the truth catalogue carries temperatures: the user is told to measure without the relativistic spectrum
    expect(io.err).toMatch(/painted non-relativistic.*--no-relativistic/);
  });
  it("is reproducible: the same seed twice gives identical files", async () => {
    const a = join(dir, "r1");
    const b = join(dir, "r2");
    expect(await run(["simulate", "--scenario", join(dir, "scenario.json"), "--seed", "9", "--out", a, "--json"])).toBe(0);
    expect(await run(["simulate", "--scenario", join(dir, "scenario.json"), "--seed", "9", "--out", b, "--json"])).toBe(0);
    for (const f of readdirSync(a)) expect(readFileSync(join(a, f)).equals(readFileSync(join(b, f)))).toBe(true);
  });
  it("exits 2 with every scenario problem listed", async () => {
    writeFileSync(join(dir, "bad.json"), JSON.stringify({ ...scenario, field: { nx: 4, ny: 64, pixelArcmin: 0 } }));
    expect(await run(["simulate", "--scenario", join(dir, "bad.json"), "--out", join(dir, "x")])).toBe(2);
    expect(io.err).toContain("bad.json");
    expect(io.err).toContain("field.nx");
    expect(io.err).toContain("field.pixelArcmin");
  });
  it("exits 2 for a missing scenario file and for a bad seed", async () => {
    expect(await run(["simulate", "--scenario", join(dir, "none.json"), "--out", join(dir, "y")])).toBe(2);
    expect(io.err).toContain("none.json");
    expect(await run(["simulate", "--scenario", join(dir, "scenario.json"), "--seed", "1.5", "--out", join(dir, "z")])).toBe(2);
    expect(io.err).toContain("--seed");
  });
});
