/**
 * Reading one 2-D image from a FITS file (uncompressed arrays by our own decoder, tile-compressed ones
 * through fitsjs-ng) into a {@link SkyMap} with its header.
 */
import { gunzipSync } from "node:zlib";
import { isMapUnit, UmbraError } from "@umbra/core";
import type { SkyMap } from "../types.js";
import { BLOCK_BYTES, type FitsHeader } from "./header.js";
import { scanHdus, type HduLayout, type HduType } from "./layout.js";
import { decodePixels } from "./pixels.js";
import { mapShape, selectHdu, type HduSelector } from "./select.js";
import { fileSource, memorySource, type ByteSource } from "./source.js";
import { wcsFromHeader } from "./wcs-link.js";

/** Options for {@link readFitsImage} and {@link parseFitsImage}. */
export interface ReadFitsOptions {
  /** HDU to read: 0-based index or EXTNAME (case-insensitive); default the first HDU holding an image. */
  hdu?: HduSelector;
  /** Accept an image whose pixels are all NaN (default false: BAD_DATA). */
  allowAllNaN?: boolean;
  /** Read into this array (length ≥ nx·ny) instead of allocating one (uncompressed images only). */
  out?: Float64Array;
  /** Parse the WCS (default true); false leaves `map.wcs` null, e.g. to inspect a file whose WCS is broken. */
  wcs?: boolean;
}

/** One image read from a FITS file. */
export interface FitsImage {
  /** The pixels as physical values (BZERO + BSCALE · stored; NaN for BLANK), WCS and unit. */
  map: SkyMap;
  /** The HDU's full header (for a compressed image: the table header with its Z keywords). */
  header: FitsHeader;
  /** Which HDU it came from. */
  hdu: { index: number; extname: string | null; type: HduType };
  /** BITPIX of the stored image (ZBITPIX for a compressed one). */
  bitpix: number;
  /** BUNIT as written, or null; `map.unit` is set when it names a known map unit. */
  bunit: string | null;
  /** The file name used in error messages. */
  file: string;
}

const GZIP_MAGIC_0 = 0x1f;
const GZIP_MAGIC_1 = 0x8b;

/** True when `bytes` start with the gzip magic number (RFC 1952 §2.3.1). */
export function isGzip(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === GZIP_MAGIC_0 && bytes[1] === GZIP_MAGIC_1;
}

function gunzip(bytes: Uint8Array, file: string): Uint8Array {
  try {
    return gunzipSync(bytes);
  } catch (e) {
    throw new UmbraError("BAD_FITS", `corrupt gzip stream: ${e instanceof Error ? e.message : String(e)}`, { file });
  }
}

/** Open `path` as a byte source: gunzipped into memory when it is gzip-compressed, else read on demand. */
export function openFitsSource(path: string): ByteSource {
  let src: ByteSource;
  try {
    src = fileSource(path);
  } catch (e) {
    if (e instanceof UmbraError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    if (code === "ENOENT") throw new UmbraError("NOT_FOUND", "no such file", { file: path });
    throw new UmbraError("BAD_FITS", `cannot open: ${e instanceof Error ? e.message : String(e)}`, { file: path });
  }
  if (isGzip(src.read(0, 2))) {
    const all = src.all();
    src.close();
    return memorySource(gunzip(all, path));
  }
  return src;
}

/** The source for in-memory bytes, gunzipped when needed. */
function bytesSource(bytes: Uint8Array, file: string): ByteSource {
  return memorySource(isGzip(bytes) ? gunzip(bytes, file) : bytes);
}

function scalingNumber(header: FitsHeader, keyword: string, fallback: number, file: string, hdu: number): number {
  const v = header.get(keyword);
  if (v === undefined) return fallback;
  if (typeof v !== "number" || !Number.isFinite(v)) {
    throw new UmbraError("BAD_FITS", `${keyword} = ${String(v)} is not a finite number`, { file, hdu, keyword });
  }
  return v;
}

function blankOf(layout: HduLayout, file: string): bigint | null {
  if (layout.bitpix < 0) return null; // BLANK applies to integer arrays only (FITS 4.0 §4.4.2.5)
  const card = layout.header.card("BLANK");
  if (card === undefined) return null;
  if (card.kind !== "integer") {
    throw new UmbraError("BAD_FITS", `BLANK = ${card.valueText || "(none)"} is not an integer`, { file, hdu: layout.index, keyword: "BLANK" });
  }
  return BigInt(card.valueText.replace(/^\+/, ""));
}

/**
 * The bytes between the end of an image's data and the end of its last block must be zero (FITS 4.0
 * §3.3.2); non-zero fill means NAXISn describe less data than the file holds.
 */
function checkFill(source: ByteSource, layout: HduLayout, file: string): void {
  const end = layout.dataOffset + layout.dataBytes;
  const fill = source.read(end, (BLOCK_BYTES - (layout.dataBytes % BLOCK_BYTES)) % BLOCK_BYTES);
  for (let i = 0; i < fill.length; i++) {
    if (fill[i] !== 0) {
      throw new UmbraError("BAD_FITS", "non-zero bytes follow the data in its last block: data size disagrees with NAXISn", {
        file,
        hdu: layout.index,
        keyword: "NAXIS",
      });
    }
  }
}

/**
 * As {@link readFitsImage}, from an open {@link ByteSource} (see {@link openFitsSource}), so several
 * HDUs of one file can be read without reopening or gunzipping it again; the caller closes it.
 */
export async function readFitsImageFromSource(source: ByteSource, file: string, options: ReadFitsOptions = {}): Promise<FitsImage> {
  return readSelected(source, file, options);
}

async function readSelected(source: ByteSource, file: string, options: ReadFitsOptions): Promise<FitsImage> {
  const hdus = scanHdus(source, file);
  const layout = selectHdu(hdus, options.hdu, file);
  const h = layout.header;
  let data: Float64Array;
  let nx: number;
  let ny: number;
  let bitpix = layout.bitpix;
  if (layout.type === "COMPRESSED_IMAGE") {
    // fitsjs-ng is loaded only when a compressed image is met (its import takes ~110 ms)
    const { decodeCompressedImage } = await import("./compressed.js");
    const c = await decodeCompressedImage(source, layout, file);
    ({ data, nx, ny } = c);
    bitpix = c.zbitpix;
  } else {
    [nx, ny] = mapShape(layout.naxes, file, layout.index);
    if (options.out !== undefined && options.out.length < nx * ny) {
      throw new UmbraError("BAD_VALUE", `output array holds ${options.out.length} values, image needs ${nx * ny}`, { file, hdu: layout.index });
    }
    const scaling = {
      bitpix,
      bscale: scalingNumber(h, "BSCALE", 1, file, layout.index),
      bzero: scalingNumber(h, "BZERO", 0, file, layout.index),
      blank: blankOf(layout, file),
    };
    checkFill(source, layout, file);
    const out = options.out === undefined ? undefined : options.out.length === nx * ny ? options.out : options.out.subarray(0, nx * ny);
    data = decodePixels(source, layout.dataOffset, nx * ny, scaling, out);
  }
  if (options.allowAllNaN !== true) {
    let finite = false;
    for (let i = 0; i < data.length && !finite; i++) finite = !Number.isNaN(data[i] as number);
    if (!finite) throw new UmbraError("BAD_DATA", "every pixel is NaN (blank)", { file, hdu: layout.index });
  }
  const bunitValue = h.get("BUNIT");
  const bunit = typeof bunitValue === "string" ? bunitValue.trim() : null;
  const map: SkyMap = { data, nx, ny, wcs: options.wcs === false ? null : wcsFromHeader(h, file) };
  if (bunit !== null && isMapUnit(bunit)) map.unit = bunit;
  return { map, header: h, hdu: { index: layout.index, extname: layout.extname, type: layout.type }, bitpix, bunit, file };
}

/**
 * Read one 2-D image from the FITS file at `path` (`.fits` or gzip-compressed `.fits.gz`, detected by
 * its magic bytes). Pixels are physical values BZERO + BSCALE · stored (FITS 4.0 eq. 3) in float64,
 * NaN for BLANK integers (FITS 4.0 §4.4.2.5) and for NaN floats. Axes beyond the second must have
 * length 1. Errors: NOT_FOUND (no file), BAD_FITS (not FITS, truncated, bad keywords, no such HDU,
 * not a 2-D image), BAD_DATA (every pixel NaN unless `allowAllNaN`), BAD_WCS (from the WCS parser).
 */
export async function readFitsImage(path: string, options: ReadFitsOptions = {}): Promise<FitsImage> {
  const source = openFitsSource(path);
  try {
    return await readSelected(source, path, options);
  } finally {
    source.close();
  }
}

/** As {@link readFitsImage}, for a FITS file already in memory; `file` names it in errors. */
export async function parseFitsImage(bytes: Uint8Array, file: string, options: ReadFitsOptions = {}): Promise<FitsImage> {
  return readSelected(bytesSource(bytes, file), file, options);
}

/** The layout of every HDU in the FITS file at `path` (headers parsed, no pixels read). */
export function readFitsLayout(path: string): HduLayout[] {
  const source = openFitsSource(path);
  try {
    return scanHdus(source, path);
  } finally {
    source.close();
  }
}

/** As {@link readFitsLayout}, for bytes in memory. */
export function parseFitsLayout(bytes: Uint8Array, file: string): HduLayout[] {
  return scanHdus(bytesSource(bytes, file), file);
}
