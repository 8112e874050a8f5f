/**
 * The FITS writer: byte-exact header cards (FITS 4.0 §4.1–4.2, IAU FITS Working Group 2016; compared
 * with the cards astropy 5.2.1 wrote into the fixtures), block structure (§3.1), round trips through
 * our reader, and astropy's verdict on files we wrote (fixtures/fits/check_written.py).
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { isUmbraError } from "@umbra/core";
import {
  encodeFits,
  formatCommentary,
  formatReal,
  formatValueCard,
  parseFitsImage,
  readFitsImage,
  writeFits,
  writeSkyMapFits,
} from "../src/fits/index.js";
import { pixelToWorld } from "../src/wcs/transform.js";
import { FIXTURES, expectedPixels, findCard, fixtureBytes } from "./fits-support.js";
import { SAMPLE_WCS, writtenSamples } from "./fits-written-samples.js";

const tmp = mkdtempSync(join(tmpdir(), "umbra-fits-write-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** The 80-character card of `keyword` as astropy wrote it into fixture `file`. */
function astropyCard(file: string, keyword: string, count = 1): string[] {
  const bytes = fixtureBytes(file);
  const p = findCard(bytes, keyword);
  return Array.from({ length: count }, (_, i) => Buffer.from(bytes.subarray(p + 80 * i, p + 80 * (i + 1))).toString("latin1"));
}

describe("header cards, byte for byte", () => {
  it("mandatory keywords use fixed format: values right-justified in columns 11–30 (FITS 4.0 §4.2), as astropy writes them", () => {
    expect(formatValueCard({ keyword: "SIMPLE", value: true, comment: "conforms to FITS standard" })).toEqual(astropyCard("f32_nan.fits", "SIMPLE"));
    expect(formatValueCard({ keyword: "BITPIX", value: -32, comment: "array data type" })).toEqual(astropyCard("f32_nan.fits", "BITPIX"));
    expect(formatValueCard({ keyword: "NAXIS", value: 2, comment: "number of array dimensions" })).toEqual(astropyCard("f32_nan.fits", "NAXIS"));
    expect(formatValueCard({ keyword: "NAXIS1", value: 7 })).toEqual(astropyCard("f32_nan.fits", "NAXIS1"));
    expect(formatValueCard({ keyword: "NAXIS1", value: 7 })[0]).toBe("NAXIS1  =                    7" + " ".repeat(50));
  });

  it("strings start in column 11, are padded to 8 characters and double their quotes (FITS 4.0 §4.2.1.1)", () => {
    expect(formatValueCard({ keyword: "SHORT", value: "ab" })).toEqual(astropyCard("header_features.fits", "SHORT"));
    expect(formatValueCard({ keyword: "QUOTED", value: "it's here" })).toEqual(astropyCard("header_features.fits", "QUOTED"));
    expect(formatValueCard({ keyword: "EMPTYSTR", value: "" })).toEqual(astropyCard("header_features.fits", "EMPTYSTR"));
    expect(formatValueCard({ keyword: "CTYPE1", value: "RA---TAN" })).toEqual(astropyCard("f64_nan.fits", "CTYPE1"));
    expect(formatValueCard({ keyword: "XTENSION", value: "IMAGE", comment: "Image extension" })).toEqual(astropyCard("multi_ext.fits", "XTENSION"));
    expect(formatValueCard({ keyword: "EXTNAME", value: "YMAP", comment: "extension name" })).toEqual(astropyCard("multi_ext.fits", "EXTNAME"));
  });

  it("long strings continue on CONTINUE cards, each piece ending in & (FITS 4.0 §4.2.1.2), exactly as astropy splits them", () => {
    const value = "a long string value that does not fit on one card, ".repeat(3) + "end";
    expect(formatValueCard({ keyword: "LONGSTR", value })).toEqual(astropyCard("header_features.fits", "LONGSTR", 3));
    expect(formatValueCard({ keyword: "LONGCOM", value, comment: "with a comment" })).toEqual(astropyCard("header_features.fits", "LONGCOM", 4));
  });

  it("a doubled quote is never split across CONTINUE cards, and long values read back unchanged", async () => {
    const value = `${"x".repeat(66)}'${"y".repeat(80)}'' and ${"'".repeat(5)}`;
    const cards = formatValueCard({ keyword: "TRICKY", value, comment: "c" });
    for (const c of cards) expect(c.length).toBe(80);
    const bytes = encodeFits([{ data: new Float64Array(1), nx: 1, ny: 1, cards: [{ keyword: "TRICKY", value, comment: "c" }] }]);
    expect((await parseFitsImage(bytes, "t.fits")).header.get("TRICKY")).toBe(value);
  });

  it("logicals, integers and reals are right-justified to column 30 like astropy's", () => {
    expect(formatValueCard({ keyword: "LOGT", value: true })).toEqual(astropyCard("header_features.fits", "LOGT"));
    expect(formatValueCard({ keyword: "INTVAL", value: -42 })).toEqual(astropyCard("header_features.fits", "INTVAL"));
    expect(formatValueCard({ keyword: "CRVAL1", value: 150.125, real: true })).toEqual(astropyCard("f64_nan.fits", "CRVAL1"));
    expect(formatValueCard({ keyword: "CRPIX1", value: 4, real: true })).toEqual(astropyCard("f64_nan.fits", "CRPIX1"));
    // astropy writes 16 significant digits (-0.00833333333333333, not the same double); we write the shortest exact text
    expect(formatValueCard({ keyword: "CDELT1", value: -0.008333333333333333, real: true })).toEqual([`CDELT1  = -0.008333333333333333${" ".repeat(49)}`]);
    expect(astropyCard("f32_nan.fits", "CDELT1")[0]!.slice(10, 30)).toBe("-0.00833333333333333");
    expect(formatValueCard({ keyword: "BSCALE", value: 0.001, real: true })).toEqual(astropyCard("i16_scaled_blank.fits", "BSCALE"));
    expect(formatValueCard({ keyword: "UNDEF", value: null })).toEqual(astropyCard("header_features.fits", "UNDEF"));
  });

  it("reals are written as the shortest text that reads back to the same double, with upper-case E and two exponent digits", () => {
    expect(formatReal(1e-7)).toBe("1.0E-07");
    expect(formatReal(-2.5e300)).toBe("-2.5E+300");
    expect(formatReal(0.1 + 0.2)).toBe("0.30000000000000004");
    expect(Number(formatReal(0.1 + 0.2))).toBe(0.1 + 0.2);
    expect(formatReal(-0)).toBe("-0.0");
  });

  it("commentary text spans as many 80-character cards as it needs", () => {
    const cards = formatCommentary({ commentary: "HISTORY", text: "x".repeat(100) });
    expect(cards).toEqual([`HISTORY ${"x".repeat(72)}`, `HISTORY ${"x".repeat(28)}`.padEnd(80)]);
  });

  it("refuses NaN and infinite header values, bad keywords and non-ASCII text with BAD_VALUE naming the keyword", () => {
    for (const bad of [
      () => formatValueCard({ keyword: "CRVAL1", value: NaN }),
      () => formatValueCard({ keyword: "CRVAL1", value: Infinity }),
      () => formatValueCard({ keyword: "lower", value: 1 }),
      () => formatValueCard({ keyword: "TOOLONGKEY", value: 1 }),
      () => formatValueCard({ keyword: "NAME", value: "caf\u00e9" }),
    ]) {
      let err: unknown;
      try {
        bad();
      } catch (e) {
        err = e;
      }
      expect(isUmbraError(err, "BAD_VALUE")).toBe(true);
    }
  });
});

describe("file structure and round trips", () => {
  it("the header and data each fill whole 2880-byte blocks: spaces after END, zeros after the data (FITS 4.0 §3.1, §3.3.2)", () => {
    const data = new Float64Array(35).fill(1);
    const bytes = encodeFits([{ data, nx: 7, ny: 5 }]);
    expect(bytes.length).toBe(2 * 2880);
    const header = Buffer.from(bytes.subarray(0, 2880)).toString("latin1");
    const end = header.indexOf("END     ");
    expect(end % 80).toBe(0);
    expect(header.slice(end + 3).trim()).toBe("");
    expect(bytes.subarray(2880 + 35 * 8).every((b) => b === 0)).toBe(true);
    // big-endian IEEE 1.0 = 3F F0 00 00 00 00 00 00 (FITS 4.0 §5.3)
    expect([...bytes.subarray(2880, 2888)]).toEqual([0x3f, 0xf0, 0, 0, 0, 0, 0, 0]);
  });

  it("reads back exactly what it wrote: float64 pixels with NaN, float32 rounding, WCS, unit, EXTNAME", async () => {
    const samples = writtenSamples();
    for (const [name, s] of Object.entries(samples)) {
      const bytes = encodeFits(s.hdus, s.options);
      for (let i = 0; i < s.hdus.length; i++) {
        const hdu = s.hdus[i]!;
        const img = await parseFitsImage(bytes, name, { hdu: i });
        const want = hdu.bitpix === -32 || (hdu.bitpix === undefined && hdu.data instanceof Float32Array) ? Float64Array.from(Float32Array.from(hdu.data)) : Float64Array.from(hdu.data);
        expect(img.map.data).toAllClose(want, { rtol: 0, atol: 0 });
        expect([img.map.nx, img.map.ny]).toEqual([hdu.nx, hdu.ny]);
        expect(img.hdu.extname).toBe(hdu.extname ?? null);
        if (hdu.bunit !== undefined) expect(img.bunit).toBe(hdu.bunit);
        if (hdu.wcs != null) expect(img.map.wcs).toEqual(hdu.wcs);
      }
    }
  });

  it("writes the provenance block with settings and input names continued over CONTINUE cards, and reads it back", async () => {
    const s = writtenSamples()["written_f64_wcs.fits"]!;
    const img = await parseFitsImage(encodeFits(s.hdus, s.options), "p.fits");
    expect(img.header.get("PROVTOOL")).toBe("umbra");
    expect(JSON.parse(String(img.header.get("PROVSETS")))).toEqual(s.options.provenance!.settings);
    expect(img.header.get("PRVIN002")).toBe(s.options.provenance!.inputs[1]!.file);
    expect(img.header.get("PRVSH002")).toBe(s.options.provenance!.inputs[1]!.sha256);
  });

  it("writes the committed written_*.fits byte for byte (the files astropy checked)", () => {
    for (const [name, s] of Object.entries(writtenSamples())) {
      expect(Buffer.from(encodeFits(s.hdus, s.options)).equals(readFileSync(`${FIXTURES}${name}`)), name).toBe(true);
    }
  });

  it("astropy 5.2.1 verifies our files strictly, without warnings, and reads our pixels and WCS", async () => {
    const verdict = JSON.parse(readFileSync(`${FIXTURES}written_verdict.json`, "utf8")) as {
      made_by: string;
      files: Record<string, { verify: string; warnings: string[]; hdus: { header: Record<string, unknown>; pixels: (number | null)[]; world_deg?: number[][] }[] }>;
    };
    expect(verdict.made_by).toMatch(/astropy 5\.2\.1/);
    const samples = writtenSamples();
    expect(Object.keys(verdict.files).sort()).toEqual(Object.keys(samples).sort());
    for (const [name, v] of Object.entries(verdict.files)) {
      expect(v.verify, name).toBe("ok");
      expect(v.warnings, name).toEqual([]);
      const ours = await readFitsImage(`${FIXTURES}${name}`, { hdu: 0 });
      expect(ours.map.data).toAllClose(expectedPixels(v.hdus[0]!.pixels), { rtol: 0, atol: 0 });
      const world = v.hdus[0]!.world_deg;
      if (world !== undefined) {
        // astropy.wcs (wcslib) world coordinates of pixels (0,0) and (6,4) against our WCS read back from the file
        const p0 = pixelToWorld(ours.map.wcs!, 0, 0);
        const p1 = pixelToWorld(ours.map.wcs!, 6, 4);
        expect([p0.lonDeg, p0.latDeg, p1.lonDeg, p1.latDeg]).toAllClose([world[0]![0]!, world[0]![1]!, world[1]![0]!, world[1]![1]!], { rtol: 1e-12 });
      }
    }
    expect(verdict.files["written_f64_wcs.fits"]!.hdus[0]!.header.PROVSETS).toBe(JSON.stringify(samples["written_f64_wcs.fits"]!.options.provenance!.settings, Object.keys(samples["written_f64_wcs.fits"]!.options.provenance!.settings).sort()));
  });

  it("writes atomically: the destination appears complete and no temporary file is left behind", async () => {
    const path = join(tmp, "map.fits");
    const map = { data: new Float64Array(35).fill(2.5), nx: 7, ny: 5, wcs: SAMPLE_WCS, unit: "uK_CMB" as const };
    await writeSkyMapFits(path, map);
    await writeSkyMapFits(path, { ...map, data: new Float64Array(35).fill(3.5) });
    expect(readdirSync(tmp)).toEqual(["map.fits"]);
    const img = await readFitsImage(path);
    expect(img.map.data).toAllClose(3.5, { rtol: 0, atol: 0 });
    expect(img.map.unit).toBe("uK_CMB");
  });

  it("refuses a data length that disagrees with nx·ny, an extension without EXTNAME, and reserved keywords as extra cards", async () => {
    const d = new Float64Array(35);
    const attempts = [
      () => encodeFits([{ data: d, nx: 6, ny: 5 }]),
      () => encodeFits([{ data: d, nx: 7, ny: 5 }, { data: d, nx: 7, ny: 5 }]),
      () => encodeFits([{ data: d, nx: 7, ny: 5, cards: [{ keyword: "NAXIS1", value: 3 }] }]),
    ];
    for (const a of attempts) expect(() => a()).toThrow(/data length|EXTNAME|set by the writer/);
    const err = await writeFits(join(tmp, "no-such-dir", "x.fits"), [{ data: d, nx: 7, ny: 5 }]).catch((e: unknown) => e);
    expect(isUmbraError(err, "NOT_FOUND")).toBe(true);
  });
});
