/**
 * Reading uncompressed FITS images against astropy 5.2.1's reading of the same files
 * (fixtures/fits/make_fixtures.py → expected.json). Integers compare exactly, floats to 1e-10 relative.
 */
import { describe, expect, it } from "vitest";
import { gzipSync } from "node:zlib";
import { parseFitsImage, readFitsImage, readFitsLayout } from "../src/fits/index.js";
import { EXPECTED, FIXTURES, expectedPixels, fixtureBytes } from "./fits-support.js";

const PLAIN = [
  "f64_nan.fits",
  "f32_nan.fits",
  "f32_nan.fits.gz",
  "i8_scaled_blank.fits",
  "i8_signed.fits",
  "i16_scaled_blank.fits",
  "u16.fits",
  "i32_scaled_blank.fits",
  "u32.fits",
  "i64_blank.fits",
  "cube_3d_degenerate.fits",
  "cube_4d_degenerate.fits",
  "header_features.fits",
];

describe("reading uncompressed images like astropy", () => {
  it("the reference values name the astropy version that made them", () => {
    expect(EXPECTED.made_by).toMatch(/astropy 5\.2\.1/);
  });

  for (const name of PLAIN) {
    it(`${name}: pixel values equal astropy's (BSCALE/BZERO FITS 4.0 eq. 3, BLANK §4.4.2.5)`, async () => {
      const exp = EXPECTED.files[name]!.hdus[0]!;
      const img = await readFitsImage(`${FIXTURES}${name}`);
      const shape = exp.shape!;
      expect(img.map.nx).toBe(shape[shape.length - 1]);
      expect(img.map.ny).toBe(shape[shape.length - 2]);
      expect(img.bitpix).toBe(exp.header.BITPIX);
      const integerImage = (exp.header.BITPIX as number) > 0 && !("BSCALE" in exp.header && exp.header.BSCALE !== 1);
      if (exp.pixels_float64 !== undefined) {
        // astropy returns float32 for scaled 8/16-bit data; the float64 scaling of its stored integers:
        expect(img.map.data).toAllClose(expectedPixels(exp.pixels_float64), { rtol: 1e-10 });
        expect(img.map.data).toAllClose(expectedPixels(exp.pixels!), { rtol: 2e-7, atol: 1e-6 });
      } else if (integerImage) {
        expect(img.map.data).toAllClose(expectedPixels(exp.pixels!), { rtol: 0, atol: 0 });
      } else {
        expect(img.map.data).toAllClose(expectedPixels(exp.pixels!), { rtol: 1e-10 });
      }
    });
  }

  it("BLANK integers become NaN and nothing else does", async () => {
    const img = await readFitsImage(`${FIXTURES}i16_scaled_blank.fits`);
    const nan = [...img.map.data].map((v, i) => (Number.isNaN(v) ? i : -1)).filter((i) => i >= 0);
    expect(nan).toEqual([1, 4 * 7 + 4]);
    const i64 = await readFitsImage(`${FIXTURES}i64_blank.fits`);
    expect(Number.isNaN(i64.map.data[1 * 7 + 1]!)).toBe(true);
    expect(i64.map.data.filter((v) => Number.isNaN(v)).length).toBe(1);
  });

  it("unsigned 16- and 32-bit images (BZERO = 2^15, 2^31; FITS 4.0 Table 11) reach 65535 and 4294967295", async () => {
    const u16 = await readFitsImage(`${FIXTURES}u16.fits`);
    expect(u16.map.data[4 * 7 + 6]).toBe(65535);
    const u32 = await readFitsImage(`${FIXTURES}u32.fits`);
    expect(u32.map.data[0]).toBe(4294967295);
  });

  it("a gzip-compressed file reads the same as the plain one", async () => {
    const a = await readFitsImage(`${FIXTURES}f32_nan.fits`);
    const b = await readFitsImage(`${FIXTURES}f32_nan.fits.gz`);
    expect(b.map.data).toAllClose(a.map.data, { rtol: 0, atol: 0 });
    const c = await parseFitsImage(gzipSync(fixtureBytes("f64_nan.fits")), "mem.fits.gz");
    expect(c.map.data).toAllClose((await readFitsImage(`${FIXTURES}f64_nan.fits`)).map.data, { rtol: 0, atol: 0 });
  });

  it("BUNIT sets the map unit when it names a known unit, and the WCS is filled from the header", async () => {
    const img = await readFitsImage(`${FIXTURES}f64_nan.fits`);
    expect(img.bunit).toBe("K_CMB");
    expect(img.map.unit).toBe("K_CMB");
    expect(img.map.wcs).not.toBeNull();
    expect(img.map.wcs!.crval).toAllClose([150.125, 2.25], { rtol: 0, atol: 0 });
    expect(img.map.wcs!.cd).toAllClose([-0.008333333333333333, 0, 0, 0.008333333333333333], { rtol: 1e-15 });
    const noWcs = await readFitsImage(`${FIXTURES}u16.fits`);
    expect(noWcs.map.wcs).toBeNull();
    expect(noWcs.map.unit).toBeUndefined();
  });

  it("reads into a caller's array when given one", async () => {
    const out = new Float64Array(35).fill(7);
    const img = await readFitsImage(`${FIXTURES}f64_nan.fits`, { out });
    expect(img.map.data.buffer).toBe(out.buffer);
    expect(out).toAllClose(expectedPixels(EXPECTED.files["f64_nan.fits"]!.hdus[0]!.pixels!), { rtol: 1e-10 });
  });
});

describe("choosing an HDU", () => {
  const file = `${FIXTURES}multi_ext.fits`;
  const exp = EXPECTED.files["multi_ext.fits"]!.hdus;

  it("lists every HDU with its type and EXTNAME, skipping the binary table by its PCOUNT/heap size", () => {
    const layout = readFitsLayout(file);
    expect(layout.map((h) => [h.index, h.type, h.extname])).toEqual([
      [0, "PRIMARY", null],
      [1, "IMAGE", "YMAP"],
      [2, "BINTABLE", "SOURCES"],
      [3, "IMAGE", "NOISE"],
    ]);
    expect(layout.map((h) => h.header.cards.length)).toEqual(exp.map((h) => h.ncards));
  });

  it("by default reads the first HDU holding an image", async () => {
    const img = await readFitsImage(file);
    expect(img.hdu).toEqual({ index: 1, extname: "YMAP", type: "IMAGE" });
    expect(img.map.data).toAllClose(expectedPixels(exp[1]!.pixels!), { rtol: 1e-10 });
  });

  it("reads an extension after a binary table by index and by EXTNAME in any case", async () => {
    const byIndex = await readFitsImage(file, { hdu: 3 });
    const byName = await readFitsImage(file, { hdu: "noise" });
    expect(byName.hdu.index).toBe(3);
    expect(byIndex.map.data).toAllClose(expectedPixels(exp[3]!.pixels!), { rtol: 1e-10 });
    expect(byName.map.data).toAllClose(byIndex.map.data, { rtol: 0, atol: 0 });
    expect(byName.map.unit).toBe("uK_CMB");
  });
});

describe("header parsing (FITS 4.0 §4.1–4.2)", () => {
  const exp = EXPECTED.files["header_features.fits"]!.hdus[0]!;

  it("parses strings with '' escapes and CONTINUE, logicals, integers, D exponents, HIERARCH, and cards past 600", async () => {
    const { header } = await readFitsImage(`${FIXTURES}header_features.fits`);
    for (const key of ["LONGSTR", "QUOTED", "SHORT", "EMPTYSTR", "LOGT", "LOGF", "INTVAL", "DEXP", "AFTER600", "UMBRA TEST VALUE"]) {
      expect(header.get(key), key).toEqual(exp.header[key]);
    }
    expect(header.cards.length).toBe(exp.ncards);
    expect(header.get("UNDEF")).toBeNull();
    expect(header.card("CPLX")!.kind).toBe("complex");
    expect(header.get("CPLX")).toBeNull();
    expect(header.get("NOSUCHKEY")).toBeUndefined();
    expect(header.cards.filter((c) => c.keyword === "HISTORY").length).toBe(650);
  });
});
