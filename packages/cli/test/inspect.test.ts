/**
 * `umbra inspect`: HDU list, WCS summary and statistics, against astropy 5.2.1's reading of the
 * fixtures (fixtures/fits/expected.json) and numpy-style statistics of those pixels.
 */
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { run } from "../src/main.js";
import { captureOutputEachTest } from "./capture.js";
import { pixelStats } from "../src/commands/inspect.js";

const FIXTURES = fileURLToPath(new URL("../../../fixtures/fits/", import.meta.url));
const EXPECTED = JSON.parse(readFileSync(`${FIXTURES}expected.json`, "utf8")) as {
  files: Record<string, { hdus: { pixels?: (number | null)[] }[] }>;
};

const io = captureOutputEachTest();

interface Json {
  files: {
    file: string;
    error?: { code: string; message: string };
    hdus?: {
      index: number;
      extname: string | null;
      type: string;
      shape: number[];
      bitpix: number;
      unit: string | null;
      wcs: { projection: string; crval_deg: number[]; center_ra_deg: number; center_dec_deg: number; pixel_arcmin: number[]; field_deg: number[] } | null;
      stats: { min: number; max: number; mean: number; std: number; nan_count: number } | null;
      error?: string;
    }[];
  }[];
}

/** min, max, mean, population std of the non-null values (numpy nanmin/nanmax/nanmean/nanstd definitions). */
function reference(list: (number | null)[]): number[] {
  const v = list.filter((x): x is number => x !== null);
  const mean = v.reduce((a, b) => a + b, 0) / v.length;
  const std = Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / v.length);
  return [Math.min(...v), Math.max(...v), mean, std, list.length - v.length];
}

describe("umbra inspect", () => {
  it("--json lists every HDU with type, shape, BITPIX, unit, WCS and statistics", async () => {
    expect(await run(["inspect", "--json", `${FIXTURES}multi_ext.fits`])).toBe(0);
    const j = JSON.parse(io.out) as Json;
    const hdus = j.files[0]!.hdus!;
    expect(hdus.map((h) => [h.index, h.type, h.extname, h.shape, h.bitpix])).toEqual([
      [0, "PRIMARY", null, [], 8],
      [1, "IMAGE", "YMAP", [7, 5], -32],
      [2, "BINTABLE", "SOURCES", [22, 3], 8],
      [3, "IMAGE", "NOISE", [7, 5], -64],
    ]);
    expect(hdus[2]!.stats).toBeNull();
    expect(hdus[3]!.unit).toBe("uK_CMB");
    const y = hdus[1]!;
    // the fixture's WCS: CRVAL (150.125, 2.25) at CRPIX (4, 3) = the centre of a 7 × 5 image, 30″ pixels
    expect(y.wcs!.projection).toBe("TAN");
    expect(y.wcs!.crval_deg).toEqual([150.125, 2.25]);
    expect([y.wcs!.center_ra_deg, y.wcs!.center_dec_deg]).toAllClose([150.125, 2.25], { rtol: 1e-12 });
    expect(y.wcs!.pixel_arcmin).toAllClose([0.5, 0.5], { rtol: 1e-12 });
    expect(y.wcs!.field_deg).toAllClose([7 / 120, 5 / 120], { rtol: 1e-12 });
    const s = y.stats!;
    expect([s.min, s.max, s.mean, s.std, s.nan_count]).toAllClose(reference(EXPECTED.files["multi_ext.fits"]!.hdus[1]!.pixels!), { rtol: 1e-12 });
  });

  it("counts NaN pixels and BLANK integers, including in tile-compressed images", async () => {
    expect(await run(["inspect", "--json", `${FIXTURES}f64_nan.fits`, `${FIXTURES}rice_int16.fits`])).toBe(0);
    const j = JSON.parse(io.out) as Json;
    const f64 = j.files[0]!.hdus![0]!.stats!;
    expect([f64.min, f64.max, f64.mean, f64.std, f64.nan_count]).toAllClose(reference(EXPECTED.files["f64_nan.fits"]!.hdus[0]!.pixels!), { rtol: 1e-12 });
    const rice = j.files[1]!.hdus![1]!;
    expect(rice.type).toBe("COMPRESSED_IMAGE");
    expect(rice.shape).toEqual([13, 11]);
    expect(rice.bitpix).toBe(16);
    expect(rice.stats!.nan_count).toBe(1);
  });

  it("describes a gzip-compressed file as the plain one", async () => {
    expect(await run(["inspect", "--json", `${FIXTURES}f32_nan.fits`, `${FIXTURES}f32_nan.fits.gz`])).toBe(0);
    const j = JSON.parse(io.out) as Json;
    expect(j.files[1]!.hdus).toEqual(j.files[0]!.hdus);
  });

  it("prints a readable text summary by default", async () => {
    expect(await run(["inspect", `${FIXTURES}multi_ext.fits`])).toBe(0);
    expect(io.out).toContain("HDU 1  IMAGE 'YMAP'  7 × 5  BITPIX -32");
    expect(io.out).toContain("WCS TAN ICRS");
    expect(io.out).toContain("pixel 0.5000 × 0.5000 arcmin");
    expect(io.out).toContain("HDU 2  BINTABLE 'SOURCES'  3 rows of 22 bytes");
  });

  it("reports a cube that is not one map inside its HDU entry without failing the file", async () => {
    expect(await run(["inspect", "--json", `${FIXTURES}cube_3d_three_planes.fits`])).toBe(0);
    const h = (JSON.parse(io.out) as Json).files[0]!.hdus![0]!;
    expect(h.shape).toEqual([7, 5, 3]);
    expect(h.error).toMatch(/NAXIS3 = 3/);
  });

  it("a file that is not FITS gives one line on stderr naming it and exit code 2, the other files are still described", async () => {
    const bad = `${FIXTURES}README.md`;
    expect(await run(["inspect", "--json", bad, `${FIXTURES}u16.fits`])).toBe(2);
    expect(io.err.trim().split("\n")).toHaveLength(1);
    expect(io.err).toContain("README.md");
    expect(io.err).toMatch(/not a FITS file/);
    const j = JSON.parse(io.out) as Json;
    expect(j.files[0]!.error!.code).toBe("BAD_FITS");
    expect(j.files[1]!.hdus![0]!.stats!.max).toBe(65535);
  });

  it("pixelStats ignores NaN and returns nulls for an all-NaN image", () => {
    expect(pixelStats(Float64Array.from([1, NaN, 3]))).toEqual({ min: 1, max: 3, mean: 2, std: 1, nan_count: 1 });
    expect(pixelStats(Float64Array.from([NaN, NaN]))).toEqual({ min: null, max: null, mean: null, std: null, nan_count: 2 });
  });
});
