/**
 * Bad FITS input gives a typed UmbraError naming the file, HDU and keyword (FITS 4.0, IAU FITS
 * Working Group 2016, defines what is well formed: §3.1 blocks, §4.4.1 mandatory keywords and END).
 */
import { describe, expect, it } from "vitest";
import { isUmbraError, type UmbraError } from "@umbra/core";
import { encodeFits, parseFitsImage, readFitsImage } from "../src/fits/index.js";
import { FIXTURES, findCard, fixtureBytes, withCard } from "./fits-support.js";

async function failure(p: Promise<unknown>): Promise<UmbraError> {
  const e = await p.then(
    () => undefined,
    (err: unknown) => err,
  );
  if (!isUmbraError(e)) throw new Error(`expected an UmbraError, got ${String(e)}`);
  return e;
}

describe("typed errors for bad FITS files", () => {
  it("a file that is not FITS", async () => {
    const e = await failure(parseFitsImage(Buffer.from("hello, this is a text file\n".repeat(200)), "notes.txt"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.message).toMatch(/^notes\.txt, HDU 0: not a FITS file/);
  });

  it("a file shorter than one 2880-byte block (FITS 4.0 §3.1)", async () => {
    const e = await failure(parseFitsImage(fixtureBytes("f64_nan.fits").subarray(0, 1000), "short.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.message).toMatch(/shorter than one 2880-byte block/);
  });

  it("a truncated data unit names the HDU and says how many bytes are missing", async () => {
    const bytes = fixtureBytes("multi_ext.fits");
    const e = await failure(parseFitsImage(bytes.subarray(0, bytes.length - 2880 - 100), "cut.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.place).toMatchObject({ file: "cut.fits", hdu: 3, keyword: "NAXIS" });
    expect(e.message).toMatch(/truncated/);
  });

  it("a header without an END card (FITS 4.0 §4.4.1)", async () => {
    const bytes = fixtureBytes("f64_nan.fits");
    const p = findCard(bytes, "END");
    bytes.fill(32, p, p + 80);
    // the data block now reads as more header cards, and the file ends before any END
    const e = await failure(parseFitsImage(bytes, "noend.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.place.keyword).toBe("END");
  });

  it("NAXISn asking for more data than the file holds", async () => {
    const e = await failure(parseFitsImage(withCard(fixtureBytes("f64_nan.fits"), "NAXIS1", "NAXIS1  =                  700"), "big.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.place).toMatchObject({ hdu: 0, keyword: "NAXIS" });
  });

  it("NAXISn describing less data than the file holds: non-zero fill after the data (FITS 4.0 §3.3.2)", async () => {
    const e = await failure(parseFitsImage(withCard(fixtureBytes("f64_nan.fits"), "NAXIS2", "NAXIS2  =                    4"), "small.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.place).toMatchObject({ hdu: 0, keyword: "NAXIS" });
    expect(e.message).toMatch(/data size disagrees with NAXISn/);
  });

  it("NAXISn undercounting by whole blocks leaves bytes after the last HDU that are neither an extension nor fill", async () => {
    const big = encodeFits([{ data: new Float64Array(2000).fill(1), nx: 100, ny: 20 }]);
    const e = await failure(parseFitsImage(withCard(big, "NAXIS2", "NAXIS2  =                    2"), "under.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.message).toMatch(/after the last HDU/);
  });

  it("an unknown BITPIX (FITS 4.0 Table 8 allows 8, 16, 32, 64, −32, −64)", async () => {
    const e = await failure(parseFitsImage(withCard(fixtureBytes("f64_nan.fits"), "BITPIX", "BITPIX  =                   24"), "b24.fits"));
    expect(e.code).toBe("BAD_FITS");
    expect(e.place.keyword).toBe("BITPIX");
    expect(e.message).toMatch(/unknown BITPIX 24/);
  });

  it("a missing mandatory NAXISn keyword", async () => {
    const e = await failure(parseFitsImage(withCard(fixtureBytes("f64_nan.fits"), "NAXIS2", "COMMENT removed"), "nonaxis.fits"));
    expect(e.place.keyword).toBe("NAXIS2");
  });

  it("an unparsable value fails where it is used, naming its keyword; elsewhere the file stays readable", async () => {
    const wcs = await failure(parseFitsImage(withCard(fixtureBytes("f64_nan.fits"), "CRVAL1", "CRVAL1  = 'unterminated"), "card.fits"));
    expect(wcs.code).toBe("BAD_WCS");
    expect(wcs.place.keyword).toBe("CRVAL1");
    const scale = await failure(parseFitsImage(withCard(fixtureBytes("i16_scaled_blank.fits"), "BSCALE", "BSCALE  = 1.0.0"), "scale.fits"));
    expect(scale.code).toBe("BAD_FITS");
    expect(scale.place.keyword).toBe("BSCALE");
    const ok = await parseFitsImage(withCard(fixtureBytes("f64_nan.fits"), "RADESYS", "RADESYS = ICRS without quotes"), "lenient.fits", { wcs: false });
    expect(ok.header.card("RADESYS")!.kind).toBe("invalid");
    expect(ok.map.data.length).toBe(35);
  });

  it("an image whose every pixel is NaN is BAD_DATA unless allowed", async () => {
    const bytes = encodeFits([{ data: new Float64Array(6).fill(NaN), nx: 3, ny: 2 }]);
    const e = await failure(parseFitsImage(bytes, "empty.fits"));
    expect(e.code).toBe("BAD_DATA");
    expect(e.message).toMatch(/^empty\.fits, HDU 0/);
    const ok = await parseFitsImage(bytes, "empty.fits", { allowAllNaN: true });
    expect(ok.map.data.every((v) => Number.isNaN(v))).toBe(true);
  });

  it("no such HDU index or EXTNAME, and a table chosen as an image", async () => {
    const file = `${FIXTURES}multi_ext.fits`;
    const e1 = await failure(readFitsImage(file, { hdu: 9 }));
    expect(e1.message).toMatch(/no HDU 9: the file has HDUs 0\.\.3/);
    const e2 = await failure(readFitsImage(file, { hdu: "CMB" }));
    expect(e2.message).toMatch(/no HDU with EXTNAME 'CMB' \(names present: YMAP, SOURCES, NOISE\)/);
    expect(e2.place.keyword).toBe("EXTNAME");
    const e3 = await failure(readFitsImage(file, { hdu: "SOURCES" }));
    expect(e3.message).toMatch(/BINTABLE extension, not an image/);
    const e4 = await failure(readFitsImage(file, { hdu: 0 }));
    expect(e4.message).toMatch(/NAXIS = 0: not a 2-D image/);
  });

  it("a cube whose third axis is longer than 1", async () => {
    const e = await failure(readFitsImage(`${FIXTURES}cube_3d_three_planes.fits`));
    expect(e.code).toBe("BAD_FITS");
    expect(e.place.keyword).toBe("NAXIS3");
  });

  it("a folder given as a file is BAD_FITS", async () => {
    const e = await failure(readFitsImage(FIXTURES));
    expect(e.code).toBe("BAD_FITS");
    expect(e.message).toMatch(/not a regular file/);
  });

  it("a missing file is NOT_FOUND, a corrupt gzip stream BAD_FITS", async () => {
    const e = await failure(readFitsImage(`${FIXTURES}no-such-file.fits`));
    expect(e.code).toBe("NOT_FOUND");
    const gz = Uint8Array.from([0x1f, 0x8b, 8, 0, 0, 0, 0, 0, 0, 3, 1, 2, 3, 4, 5]);
    const e2 = await failure(parseFitsImage(gz, "bad.fits.gz"));
    expect(e2.code).toBe("BAD_FITS");
    expect(e2.message).toMatch(/corrupt gzip/);
  });
});
