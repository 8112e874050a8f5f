/**
 * Tile-compressed images (Pence et al. 2010 tiled-image convention; FITS 4.0 §10) read through
 * fitsjs-ng 1.0.2 against astropy 5.2.1's reading, with one test per trap of that library.
 */
import { afterEach, describe, expect, it, vi } from "vitest";
import { gzipSync } from "node:zlib";
import { isUmbraError } from "@umbra/core";
import { parseFitsImage, readFitsImage, readFitsLayout } from "../src/fits/index.js";
import { EXPECTED, FIXTURES, expectedPixels, findCard, fixtureBytes } from "./fits-support.js";

afterEach(() => {
  vi.restoreAllMocks();
});

describe("tile-compressed images", () => {
  for (const [name, hdu] of [
    ["rice_int16.fits", "RICE16"],
    ["hcompress_int16.fits", "HC16"],
    ["gzip_float32.fits", "GZ32"],
    ["gzip_float32_lossless.fits", "GZ32L"],
    ["rice_float32_dither.fits", "RICEDITH"],
  ] as const) {
    it(`${name}: pixel values equal astropy's (exact for integers, 1e-10 relative for floats)`, async () => {
      const exp = EXPECTED.files[name]!.hdus[1]!;
      const img = await readFitsImage(`${FIXTURES}${name}`);
      expect(img.hdu).toEqual({ index: 1, extname: hdu, type: "COMPRESSED_IMAGE" });
      expect([img.map.ny, img.map.nx]).toEqual(exp.shape);
      const integer = exp.dtype!.includes("int");
      const expected = expectedPixels(exp.pixels!);
      // astropy returns unscaled integers as stored, BLANK included; FITS 4.0 §4.4.2.5 makes BLANK undefined
      if (integer && typeof exp.header.BLANK === "number") for (let i = 0; i < expected.length; i++) if (expected[i] === exp.header.BLANK) expected[i] = NaN;
      expect(img.map.data).toAllClose(expected, integer ? { rtol: 0, atol: 0 } : { rtol: 1e-10 });
    });
  }

  it("applies BLANK to integer tiles (fitsjs-ng alone returns the stored BLANK value)", async () => {
    const img = await readFitsImage(`${FIXTURES}rice_int16.fits`);
    expect(Number.isNaN(img.map.data[5 * 13 + 6]!)).toBe(true);
    expect(img.map.data.filter((v) => Number.isNaN(v)).length).toBe(1);
  });

  it("reads headers longer than 600 cards whole (fitsjs-ng cuts them by default)", async () => {
    const img = await readFitsImage(`${FIXTURES}rice_int16.fits`);
    expect(img.header.cards.length).toBe((EXPECTED.files["rice_int16.fits"]!.hdus[1] as { ncards_table?: number }).ncards_table);
    expect(img.header.cards.length).toBeGreaterThan(600);
    expect(img.bunit).toBe("uK_CMB");
  });

  it("reads a gzipped compressed file (fitsjs-ng alone finds zero HDUs in .fits.gz)", async () => {
    const img = await parseFitsImage(gzipSync(fixtureBytes("rice_int16.fits")), "rice_int16.fits.gz");
    const ref = await readFitsImage(`${FIXTURES}rice_int16.fits`);
    expect(img.map.data).toAllClose(ref.map.data, { rtol: 0, atol: 0 });
  });

  it("reads quantised floats despite the empty GZIP_COMPRESSED_DATA column astropy writes", async () => {
    const layout = readFitsLayout(`${FIXTURES}gzip_float32.fits`);
    expect(layout[1]!.header.get("TTYPE2")).toBe("GZIP_COMPRESSED_DATA");
    const img = await readFitsImage(`${FIXTURES}gzip_float32.fits`);
    expect(img.map.data.every((v) => Number.isFinite(v))).toBe(true);
    expect(img.map.data).toAllClose(expectedPixels(EXPECTED.files["gzip_float32.fits"]!.hdus[1]!.pixels!), { rtol: 1e-10 });
  });

  it("refuses, with a typed error, tiles stored in a non-empty GZIP_COMPRESSED_DATA column", async () => {
    const bytes = fixtureBytes("gzip_float32.fits");
    const layout = readFitsLayout(`${FIXTURES}gzip_float32.fits`)[1]!;
    // row 1, column 2 starts 8 bytes into the row (after COMPRESSED_DATA's 1PB descriptor): set its count to 1
    new DataView(bytes.buffer).setInt32(layout.dataOffset + 8, 1, false);
    const err = await parseFitsImage(bytes, "gz.fits").catch((e: unknown) => e);
    expect(isUmbraError(err, "BAD_FITS")).toBe(true);
    expect((err as Error).message).toMatch(/gz\.fits, HDU 1.*GZIP_COMPRESSED_DATA/);
  });

  it("prints nothing on the console (fitsjs-ng warns there by default)", async () => {
    const warn = vi.spyOn(console, "warn");
    const log = vi.spyOn(console, "log");
    await readFitsImage(`${FIXTURES}rice_int16.fits`);
    await readFitsImage(`${FIXTURES}gzip_float32.fits`);
    expect(warn).not.toHaveBeenCalled();
    expect(log).not.toHaveBeenCalled();
  });

  it("turns a corrupt tile into BAD_FITS naming the file and HDU", async () => {
    const bytes = fixtureBytes("gzip_float32_lossless.fits");
    const layout = readFitsLayout(`${FIXTURES}gzip_float32_lossless.fits`)[1]!;
    const heap = layout.dataOffset + layout.naxes[0]! * layout.naxes[1]!;
    bytes.fill(0x55, heap, heap + 40);
    const err = await parseFitsImage(bytes, "broken.fits").catch((e: unknown) => e);
    expect(isUmbraError(err, "BAD_FITS")).toBe(true);
    expect((err as Error).message).toMatch(/^broken\.fits, HDU 1/);
  });

  it("refuses a missing or invalid RICE BLOCKSIZE before fitsjs-ng loops forever on it (found by the fuzz test)", async () => {
    for (const card of ["ZVAL1   ={                  32", "ZVAL1   =                    0"]) {
      const bytes = fixtureBytes("rice_float32_dither.fits");
      const p = findCard(bytes, "ZVAL1", 2880);
      bytes.set(Buffer.from(card.padEnd(80), "latin1"), p);
      const err = await parseFitsImage(bytes, "rice.fits").catch((e: unknown) => e);
      expect(isUmbraError(err, "BAD_FITS")).toBe(true);
      expect((err as { place: { keyword?: string } }).place.keyword).toBe("ZVAL1");
    }
  });

  it("refuses a table whose TFORMn widths disagree with NAXIS1 (found by the fuzz test: it read past the row)", async () => {
    const bytes = fixtureBytes("gzip_float32.fits");
    const p = findCard(bytes, "NAXIS1", 2880);
    bytes.set(Buffer.from("NAXIS1  =                    3".padEnd(80), "latin1"), p);
    const err = await parseFitsImage(bytes, "w.fits").catch((e: unknown) => e);
    expect(isUmbraError(err, "BAD_FITS")).toBe(true);
    expect((err as { place: { keyword?: string } }).place.keyword).toBe("NAXIS1");
  });

  it("refuses ZBITPIX 32 (fitsjs-ng returns float32, which cannot hold every 32-bit integer)", async () => {
    const bytes = fixtureBytes("rice_int16.fits");
    const p = findCard(bytes, "ZBITPIX");
    bytes.set(Buffer.from("ZBITPIX =                   32".padEnd(80), "latin1"), p);
    const err = await parseFitsImage(bytes, "z32.fits").catch((e: unknown) => e);
    expect(isUmbraError(err, "BAD_FITS")).toBe(true);
    expect((err as { place: { keyword?: string } }).place.keyword).toBe("ZBITPIX");
  });
});
