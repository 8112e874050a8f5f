import { mkdtemp, mkdir, readFile, readdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import { loadBandManifest, writeBandManifest } from "../src/manifest/index.js";

let dir = "";
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "umbra-manifest-"));
  await mkdir(join(dir, "maps"));
  for (const f of ["maps/f090.fits", "maps/f150.fits", "maps/f150_ivar.fits", "maps/mask.fits", "beam_f090.txt", "bp_f150.txt"]) {
    await writeFile(join(dir, f), "x");
  }
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const good = {
  name: "invented-survey-field-A",
  notes: "two bands, invented",
  bands: [
    { name: "f090", map: "maps/f090.fits", frequency_ghz: 90, beam: "beam_f090.txt", unit: "uK_CMB", hdu: 0 },
    { name: "f150", map: "maps/f150.fits", bandpass: "bp_f150.txt", beam_fwhm_arcmin: 1.4, unit: "K_CMB", ivar: "maps/f150_ivar.fits", mask: "maps/mask.fits", hdu: "SIGNAL" },
  ],
};

async function put(name: string, obj: unknown): Promise<string> {
  const p = join(dir, name);
  await writeFile(p, typeof obj === "string" ? obj : JSON.stringify(obj));
  return p;
}

async function problemsOf(p: string): Promise<string[]> {
  try {
    await loadBandManifest(p);
  } catch (e) {
    if (isUmbraError(e, "BAD_MANIFEST")) return [...e.problems];
    throw e;
  }
  throw new Error("expected BAD_MANIFEST");
}

describe("loadBandManifest", () => {
  it("resolves paths relative to the manifest and types the fields", async () => {
    const { manifest, warnings } = await loadBandManifest(await put("good.json", good));
    expect(manifest.name).toBe("invented-survey-field-A");
    expect(manifest.bands.map((b) => b.name)).toEqual(["f090", "f150"]);
    const [a, b] = manifest.bands;
    expect(a?.mapPath).toBe(join(dir, "maps/f090.fits"));
    expect(a?.frequencyGHz).toBe(90);
    expect(a?.beamPath).toBe(join(dir, "beam_f090.txt"));
    expect(a?.beamFwhmArcmin).toBeNull();
    expect(a?.hdu).toBe(0);
    expect(b?.bandpassPath).toBe(join(dir, "bp_f150.txt"));
    expect(b?.beamFwhmArcmin).toBe(1.4);
    expect(b?.ivarPath).toBe(join(dir, "maps/f150_ivar.fits"));
    expect(b?.unit).toBe("K_CMB");
    expect(warnings).toEqual([]);
  });

  it("turns unknown keys into warnings, not errors", async () => {
    const m = { ...good, comment: "x", bands: [{ ...good.bands[0], colour: "red" }] };
    const { warnings } = await loadBandManifest(await put("unknown.json", m));
    expect(warnings).toHaveLength(2);
    expect(warnings.join("\n")).toContain("'comment'");
    expect(warnings.join("\n")).toContain("band 'f090' (bands[0]): unknown key 'colour'");
  });

  it("reports every problem at once, each naming the band and field", async () => {
    const bad = {
      bands: [
        { name: "f090", map: "maps/missing.fits", frequency_ghz: -3, beam_fwhm_arcmin: 2, unit: "K_CMB" },
        { name: "f150", map: "maps/f150.fits", beam_fwhm_arcmin: "wide", unit: "kelvin" },
        { name: "f150", map: "maps/f150.fits", frequency_ghz: 150, unit: "K_CMB", ivar: "nope.fits" },
        { map: "maps/f150.fits", frequency_ghz: 150, beam_fwhm_arcmin: 1, unit: "K_CMB" },
      ],
    };
    const problems = await problemsOf(await put("bad.json", bad));
    const text = problems.join("\n");
    expect(text).toContain("band 'f090' (bands[0]): field 'frequency_ghz'");
    expect(text).toContain("band 'f150' (bands[1]): field 'beam_fwhm_arcmin'");
    expect(text).toContain("band 'f150' (bands[1]): field 'unit'");
    expect(text).toContain("band 'f150' (bands[2]): field 'beam_fwhm_arcmin': give beam_fwhm_arcmin or beam");
    expect(text).toContain("band 'f150' (bands[2]): field 'name': duplicate of bands[1]");
    expect(text).toContain("band 'f150' (bands[2]): field 'ivar': file not found: nope.fits");
    expect(text).toContain("bands[3]: field 'name': required field is missing");
    expect(text).toContain("band 'f090' (bands[0]): field 'map': file not found: maps/missing.fits");
    expect(problems.length).toBe(8);
  });

  it("reports missing files of an otherwise valid band", async () => {
    const m = { bands: [{ name: "f220", map: "maps/f220.fits", frequency_ghz: 220, beam_fwhm_arcmin: 1, unit: "MJy/sr", mask: "maps/m.fits" }] };
    const problems = await problemsOf(await put("missing.json", m));
    expect(problems.sort()).toEqual([
      "band 'f220' (bands[0]): field 'map': file not found: maps/f220.fits",
      "band 'f220' (bands[0]): field 'mask': file not found: maps/m.fits",
    ]);
  });

  it("rejects invalid JSON, an empty band list and a missing file with typed errors", async () => {
    await expect(loadBandManifest(await put("broken.json", "{ bands: "))).rejects.toMatchObject({ code: "BAD_MANIFEST" });
    const empty = await problemsOf(await put("empty.json", { bands: [] }));
    expect(empty[0]).toContain("field 'bands'");
    await expect(loadBandManifest(join(dir, "does-not-exist.json"))).rejects.toMatchObject({ code: "NOT_FOUND" });
  });
});

describe("writeBandManifest", () => {
  it("writes a manifest that loads back identically, with paths relative to its new folder", async () => {
    const { manifest } = await loadBandManifest(await put("good2.json", good));
    await mkdir(join(dir, "out"), { recursive: true });
    const target = join(dir, "out", "copy.json");
    await writeBandManifest(target, manifest);
    const text = JSON.parse(await readFile(target, "utf8")) as { bands: Array<{ map: string }> };
    expect(text.bands[0]?.map).toBe("../maps/f090.fits");
    const again = await loadBandManifest(target);
    expect(again.manifest.bands).toEqual(manifest.bands);
    expect((await readdir(join(dir, "out"))).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
});
