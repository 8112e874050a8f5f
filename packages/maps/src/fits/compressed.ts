/**
 * Tile-compressed images (a BINTABLE with ZIMAGE = T; Pence et al. 2010, "Tiled image convention
 * for storing compressed images in FITS binary tables", FITS registered convention; FITS 4.0 §10)
 * decoded through fitsjs-ng 1.0.2, with its measured traps worked around:
 *
 * - BLANK is never applied: we hide BLANK/BSCALE/BZERO from it, take the stored integers it returns
 *   and apply BLANK/ZBLANK → NaN and BZERO + BSCALE · stored ourselves, in float64.
 * - An all-empty GZIP_COMPRESSED_DATA column (astropy writes one for quantised floats) makes it fail
 *   with "invalid gzip data": we rename that column in the copy of the header we hand it; tiles that
 *   really use it (lossless fallback tiles) are refused with a typed error.
 * - Headers are cut at 600 cards unless `maxHeaderLines` is raised: we raise it to the card count.
 * - Warnings go to console.warn: we collect them instead.
 * - GZIP_1 tiles of quantised floats (32-bit integers plus ZSCALE/ZZERO) are read as float32 bytes
 *   because it picks the tile type from ZBITPIX: we tell it ZBITPIX = 32 for those.
 * - Every image comes back as Float32Array: ZBITPIX 32, 64 and −64 would lose precision, so they
 *   are refused with a typed error rather than returned rounded.
 */
import { UmbraError } from "@umbra/core";
import { FITS, type CompressedImage } from "fitsjs-ng";
import { ascii, BLOCK_BYTES, CARD_BYTES } from "./header.js";
import type { HduLayout } from "./layout.js";
import { mapShape } from "./select.js";
import type { ByteSource } from "./source.js";

/** NULL value fitsjs-ng assumes for quantised floats (Pence et al. 2010 default ZBLANK). */
const QUANTISED_NULL = -2147483647;

/** Largest image decompressed (2^28 pixels, 2 GiB as float64): a corrupt ZNAXISn must not exhaust memory. */
const MAX_PIXELS = 2 ** 28;

/** Byte width of one element of each binary-table TFORM type code (FITS 4.0 Table 18). */
const TFORM_BYTES: Record<string, number> = { L: 1, B: 1, I: 2, J: 4, K: 8, A: 1, E: 4, D: 8, C: 8, M: 16, P: 8, Q: 16 };

interface Column {
  name: string;
  offset: number;
  /** Byte just after the field. */
  end: number;
  code: string;
}

function columns(layout: HduLayout, file: string): Column[] {
  const h = layout.header;
  const n = h.get("TFIELDS");
  const out: Column[] = [];
  let offset = 0;
  for (let k = 1; typeof n === "number" && k <= n; k++) {
    const form = String(h.get(`TFORM${k}`) ?? "").trim();
    const m = /^([0-9]*)([LXBIJKAEDCMPQ])/.exec(form);
    if (m === null) throw new UmbraError("BAD_FITS", `cannot read TFORM${k} = '${form}'`, { file, hdu: layout.index, keyword: `TFORM${k}` });
    const repeat = m[1] === "" ? 1 : Number(m[1]);
    const code = m[2] as string;
    const start = offset;
    offset += code === "X" ? Math.ceil(repeat / 8) : repeat * (TFORM_BYTES[code] as number);
    out.push({ name: String(h.get(`TTYPE${k}`) ?? "").trim().toUpperCase(), offset: start, end: offset, code });
  }
  return out;
}

function bad(message: string, file: string, hdu: number, keyword?: string): UmbraError {
  return new UmbraError("BAD_FITS", message, keyword === undefined ? { file, hdu } : { file, hdu, keyword });
}

/**
 * Check the ZNAMEi/ZVALi algorithm parameters before fitsjs-ng sees them: it takes a missing ZVALi as
 * 0, and a RICE_1 BLOCKSIZE of 0 sends its decoder into an endless loop (found by our fuzz test).
 * RICE_1: BLOCKSIZE 16 or 32, BYTEPIX 1, 2, 4 or 8; HCOMPRESS_1: SCALE ≥ 0, SMOOTH 0 or 1
 * (Pence et al. 2010 tiled-image convention, §4.1–4.3).
 */
function checkAlgorithmParameters(h: HduLayout["header"], cmp: string, file: string, hdu: number): void {
  for (let i = 1; h.has(`ZNAME${i}`); i++) {
    const name = String(h.get(`ZNAME${i}`)).trim().toUpperCase();
    const value = h.get(`ZVAL${i}`);
    if (typeof value !== "number" || !Number.isFinite(value)) throw bad(`ZVAL${i} (${name}) is missing or not a number`, file, hdu, `ZVAL${i}`);
    const ok =
      cmp === "RICE_1" && name === "BLOCKSIZE"
        ? value === 16 || value === 32
        : cmp === "RICE_1" && name === "BYTEPIX"
          ? [1, 2, 4, 8].includes(value)
          : cmp === "HCOMPRESS_1" && name === "SCALE"
            ? value >= 0
            : cmp === "HCOMPRESS_1" && name === "SMOOTH"
              ? value === 0 || value === 1
              : true;
    if (!ok) throw bad(`${name} = ${value} is not a valid ${cmp} parameter`, file, hdu, `ZVAL${i}`);
  }
}

/** A primary header with no data, one block long (FITS 4.0 §4.4.1.1). */
function emptyPrimary(): Uint8Array {
  const cards = ["SIMPLE  =                    T", "BITPIX  =                    8", "NAXIS   =                    0", "END"];
  return Buffer.from(cards.map((c) => c.padEnd(CARD_BYTES)).join("").padEnd(BLOCK_BYTES), "latin1");
}

/**
 * Decode the tile-compressed image in HDU `layout` of `source` into float64 physical values
 * (row-major, x fastest), NaN for undefined pixels. Throws BAD_FITS naming the file, HDU and keyword
 * for unsupported algorithms or pixel types, a tile count that disagrees with ZNAXISn/ZTILEn, or a
 * decoding failure inside fitsjs-ng.
 */
export async function decodeCompressedImage(
  source: ByteSource,
  layout: HduLayout,
  file: string,
): Promise<{ data: Float64Array; nx: number; ny: number; zbitpix: number }> {
  const h = layout.header;
  const hdu = layout.index;
  const zbitpix = h.get("ZBITPIX");
  const znaxis = h.get("ZNAXIS");
  if (typeof znaxis !== "number" || !Number.isInteger(znaxis) || znaxis < 0 || znaxis > 999) {
    throw bad(`ZNAXIS = ${String(znaxis)} is not a valid axis count`, file, hdu, "ZNAXIS");
  }
  const znaxes: number[] = [];
  for (let k = 1; k <= znaxis; k++) {
    const v = h.get(`ZNAXIS${k}`);
    if (typeof v !== "number" || !Number.isInteger(v) || v < 0) throw bad(`ZNAXIS${k} = ${String(v)} is not a length`, file, hdu, `ZNAXIS${k}`);
    znaxes.push(v);
  }
  const [nx, ny] = mapShape(znaxes, file, hdu, "ZNAXIS");
  if (nx * ny > MAX_PIXELS) throw bad(`image of ${nx} × ${ny} pixels exceeds the ${MAX_PIXELS}-pixel limit for decompression`, file, hdu, "ZNAXIS1");
  if (zbitpix !== 8 && zbitpix !== 16 && zbitpix !== -32) {
    throw bad(
      `ZBITPIX = ${String(zbitpix)} is not supported for tile-compressed images (fitsjs-ng returns float32, exact only for 8/16-bit integers and float32)`,
      file,
      hdu,
      "ZBITPIX",
    );
  }
  const cmp = String(h.get("ZCMPTYPE") ?? "").trim();
  if (cmp !== "RICE_1" && cmp !== "GZIP_1" && cmp !== "HCOMPRESS_1") {
    throw bad(`compression '${cmp}' is not supported (RICE_1, GZIP_1, HCOMPRESS_1 are)`, file, hdu, "ZCMPTYPE");
  }
  const tx = h.get("ZTILE1") ?? nx;
  const ty = h.get("ZTILE2") ?? 1;
  if (typeof tx !== "number" || typeof ty !== "number" || !Number.isInteger(tx) || !Number.isInteger(ty) || tx < 1 || ty < 1) {
    throw bad("ZTILE1/ZTILE2 are not positive integers", file, hdu, "ZTILE1");
  }
  for (let k = 3; k <= znaxis; k++) {
    const t = h.get(`ZTILE${k}`) ?? 1;
    if (t !== 1) throw bad(`ZTILE${k} = ${String(t)}: only 2-D tiles are supported`, file, hdu, `ZTILE${k}`);
  }
  checkAlgorithmParameters(h, cmp, file, hdu);
  const rows = layout.naxes[1] ?? 0;
  const rowBytes = layout.naxes[0] ?? 0;
  const tiles = Math.ceil(nx / tx) * Math.ceil(ny / ty);
  if (rows !== tiles) throw bad(`table has ${rows} tile rows but ZNAXISn/ZTILEn need ${tiles}`, file, hdu, "NAXIS2");

  const cols = columns(layout, file);
  const width = cols.reduce((w, c) => Math.max(w, c.end), 0);
  if (width !== rowBytes) throw bad(`columns from TFORMn span ${width} bytes but NAXIS1 = ${rowBytes} (FITS 4.0 §7.3.1)`, file, hdu, "NAXIS1");
  if (cols.some((c) => c.name === "ZBLANK")) throw bad("a ZBLANK column is not supported (fitsjs-ng ignores it)", file, hdu, "TTYPE");
  if (!cols.some((c) => c.name === "COMPRESSED_DATA")) throw bad("no COMPRESSED_DATA column", file, hdu, "TTYPE");
  const gz = cols.find((c) => c.name === "GZIP_COMPRESSED_DATA");
  if (gz !== undefined) {
    if (gz.code !== "P" && gz.code !== "Q") throw bad("GZIP_COMPRESSED_DATA is not a variable-length column", file, hdu, "TFORM");
    const table = source.read(layout.dataOffset, rows * rowBytes);
    const view = new DataView(table.buffer, table.byteOffset, table.byteLength);
    for (let r = 0; r < rows; r++) {
      const count = gz.code === "P" ? view.getInt32(r * rowBytes + gz.offset, false) : Number(view.getBigInt64(r * rowBytes + gz.offset, false));
      if (count !== 0) {
        throw bad(`tile ${r + 1} is stored losslessly in GZIP_COMPRESSED_DATA, which fitsjs-ng cannot decode`, file, hdu, "GZIP_COMPRESSED_DATA");
      }
    }
  }
  const zblank = h.get("ZBLANK");
  if (zbitpix === -32 && zblank !== undefined && zblank !== QUANTISED_NULL) {
    throw bad(`ZBLANK = ${String(zblank)} differs from ${QUANTISED_NULL}, the only null value fitsjs-ng applies`, file, hdu, "ZBLANK");
  }

  const quantised = cols.some((c) => c.name === "ZSCALE") || h.has("ZSCALE");
  // Copy of the header for fitsjs-ng: BLANK/BSCALE/BZERO turned into commentary, the empty gzip column renamed.
  const headerText = ascii(source.read(layout.headerOffset, layout.dataOffset - layout.headerOffset));
  let copy = "";
  for (let p = 0; p < headerText.length; p += CARD_BYTES) {
    let card = headerText.slice(p, p + CARD_BYTES);
    const key = card.slice(0, 8).trimEnd();
    if (key === "BLANK" || key === "BSCALE" || key === "BZERO" || key === "ZBLANK") card = `COMMENT ${card.slice(8)}`;
    card = card.replace("'GZIP_COMPRESSED_DATA'", "'UNUSED_EMPTY_COLUMN_'");
    // quantised floats hold 32-bit integers: fitsjs-ng's GZIP_1 path reads tiles by ZBITPIX, so say 32
    if (quantised && key === "ZBITPIX") card = "ZBITPIX =                   32".padEnd(CARD_BYTES);
    copy += card;
  }
  const paddedData = Math.ceil(layout.dataBytes / BLOCK_BYTES) * BLOCK_BYTES;
  const primary = emptyPrimary();
  const buf = new Uint8Array(primary.length + copy.length + paddedData);
  buf.set(primary, 0);
  buf.set(Buffer.from(copy, "latin1"), primary.length);
  source.readInto(layout.dataOffset, buf.subarray(primary.length + copy.length, primary.length + copy.length + layout.dataBytes));

  const warnings: string[] = [];
  let pixels: Float32Array;
  try {
    const fits = FITS.fromArrayBuffer(buf.buffer, { maxHeaderLines: copy.length / CARD_BYTES + 36, onWarning: (m) => warnings.push(m) });
    const unit = fits.hdus[1]?.data as CompressedImage | undefined;
    if (unit === undefined || typeof unit.getFrame !== "function") throw new Error("fitsjs-ng found no compressed image");
    pixels = await unit.getFrame(0);
  } catch (e) {
    if (e instanceof UmbraError) throw e;
    const why = e instanceof Error ? e.message : String(e);
    throw bad(`cannot decode tile-compressed image: ${why}${warnings.length > 0 ? ` (warnings: ${warnings.join("; ")})` : ""}`, file, hdu, "ZCMPTYPE");
  }
  if (pixels.length !== nx * ny) throw bad(`decoder returned ${pixels.length} pixels, expected ${nx * ny}`, file, hdu, "ZNAXIS");

  const bscale = h.get("BSCALE") ?? 1;
  const bzero = h.get("BZERO") ?? 0;
  if (typeof bscale !== "number" || typeof bzero !== "number") throw bad("BSCALE/BZERO are not numbers", file, hdu, "BSCALE");
  const blankValue = zbitpix > 0 ? (h.get("ZBLANK") ?? h.get("BLANK")) : undefined;
  const blank = typeof blankValue === "number" ? blankValue : NaN; // NaN never matches
  const data = new Float64Array(nx * ny);
  for (let i = 0; i < data.length; i++) {
    const raw = pixels[i] as number;
    data[i] = raw === blank ? NaN : bzero + bscale * raw;
  }
  return { data, nx, ny, zbitpix };
}
