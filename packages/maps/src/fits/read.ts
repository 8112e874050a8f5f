/**
 * Reading one 2-D image from a FITS file (uncompressed arrays by our own decoder, tile-compressed ones
 * through fitsjs-ng) into a {@link SkyMap} with its header.
 */
import { gunzipSync } from "node:zlib";
import { isMapUnit, UmbraError } from "@umbra/core";
import type { SkyMap } from "../types.js";
import { BLOCK_BYTES, type FitsHeader } from "./header.js";
import { scanHdus, type HduLayout, type HduType } from "./layout.js";
import { decodePixels, decodePixelsFloat32, FLOAT32_BITPIX } from "./pixels.js";
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
  /** Element type of the pixels: "float64" (the default; a {@link SkyMap}). See {@link ReadFitsFloat32Options}. */
  dtype?: "float64";
}

/**
 * Options for reading an image as float32 (BITPIX −32, 16 or 8 only; compressed images with ZBITPIX
 * −32, 16 or 8): the like-for-like of astropy's `.data` for a float32 image, half the memory of a
 * float64 read. Other BITPIX values are refused (BAD_VALUE naming BITPIX) rather than rounded.
 */
export interface ReadFitsFloat32Options extends Omit<ReadFitsOptions, "out" | "dtype"> {
  dtype: "float32";
  /** Read into this array (length ≥ nx·ny) instead of allocating one (uncompressed images only). */
  out?: Float32Array;
}

/** A {@link SkyMap} whose pixels are float32. */
export interface SkyMapFloat32 extends Omit<SkyMap, "data"> {
  /** Pixel values, row-major, x fastest, native byte order; NaN marks missing pixels. */
  data: Float32Array;
}

/** One image read from a FITS file; `M` is {@link SkyMap} (float64) or {@link SkyMapFloat32}. */
export interface FitsImage<M extends SkyMap | SkyMapFloat32 = SkyMap> {
  /** The pixels as physical values (BZERO + BSCALE · stored; NaN for BLANK), WCS and unit. */
  map: M;
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

/** Either option set (for callers that choose the output type at run time). */
export type AnyReadOptions = ReadFitsOptions | ReadFitsFloat32Options;
/** The result of a read whose output type is chosen at run time. */
export type AnyFitsImage = FitsImage | FitsImage<SkyMapFloat32>;

/**
 * As {@link readFitsImage}, from an open {@link ByteSource} (see {@link openFitsSource}), so several
 * HDUs of one file can be read without reopening or gunzipping it again; the caller closes it.
 */
export async function readFitsImageFromSource(source: ByteSource, file: string, options: ReadFitsFloat32Options): Promise<FitsImage<SkyMapFloat32>>;
export async function readFitsImageFromSource(source: ByteSource, file: string, options?: ReadFitsOptions): Promise<FitsImage>;
export async function readFitsImageFromSource(source: ByteSource, file: string, options?: AnyReadOptions): Promise<AnyFitsImage>;
export async function readFitsImageFromSource(source: ByteSource, file: string, options: AnyReadOptions = {}): Promise<AnyFitsImage> {
  return readSelected(source, file, options);
}

function refuseFloat32(bitpix: number, file: string, hdu: number, keyword: string): void {
  if (!FLOAT32_BITPIX.includes(bitpix)) {
    throw new UmbraError("BAD_VALUE", `float32 output cannot hold ${keyword} = ${bitpix} values exactly: read it as float64 (the default)`, {
      file,
      hdu,
      keyword,
    });
  }
}

function checkOut(out: Float64Array | Float32Array | undefined, n: number, file: string, hdu: number): void {
  if (out !== undefined && out.length < n) {
    throw new UmbraError("BAD_VALUE", `output array holds ${out.length} values, image needs ${n}`, { file, hdu });
  }
}

async function readSelected(source: ByteSource, file: string, options: AnyReadOptions): Promise<AnyFitsImage> {
  const hdus = scanHdus(source, file);
  const layout = selectHdu(hdus, options.hdu, file);
  const h = layout.header;
  const float32 = options.dtype === "float32";
  let data: Float64Array | Float32Array;
  let nx: number;
  let ny: number;
  let bitpix = layout.bitpix;
  if (layout.type === "COMPRESSED_IMAGE") {
    // fitsjs-ng is loaded only when a compressed image is met (its import takes ~110 ms)
    const { decodeCompressedImage } = await import("./compressed.js");
    const c = await decodeCompressedImage(source, layout, file);
    ({ nx, ny } = c);
    bitpix = c.zbitpix;
    if (float32) refuseFloat32(bitpix, file, layout.index, "ZBITPIX");
    data = float32 ? new Float32Array(c.data) : c.data; // each value rounded once to float32 (exact unless dequantised)
  } else {
    if (float32) refuseFloat32(bitpix, file, layout.index, "BITPIX");
    [nx, ny] = mapShape(layout.naxes, file, layout.index);
    const n = nx * ny;
    checkOut(options.out, n, file, layout.index);
    const scaling = {
      bitpix,
      bscale: scalingNumber(h, "BSCALE", 1, file, layout.index),
      bzero: scalingNumber(h, "BZERO", 0, file, layout.index),
      blank: blankOf(layout, file),
    };
    checkFill(source, layout, file);
    const place = { file, hdu: layout.index };
    if (options.dtype === "float32") {
      const out = options.out === undefined || options.out.length === n ? options.out : options.out.subarray(0, n);
      data = decodePixelsFloat32(source, layout.dataOffset, n, scaling, out, place);
    } else {
      const out = options.out === undefined || options.out.length === n ? options.out : options.out.subarray(0, n);
      data = decodePixels(source, layout.dataOffset, n, scaling, out, place);
    }
  }
  if (options.allowAllNaN !== true) {
    let finite = false;
    for (let i = 0; i < data.length && !finite; i++) finite = !Number.isNaN(data[i] as number);
    if (!finite) throw new UmbraError("BAD_DATA", "every pixel is NaN (blank)", { file, hdu: layout.index });
  }
  const bunitValue = h.get("BUNIT");
  const bunit = typeof bunitValue === "string" ? bunitValue.trim() : null;
  const wcs = options.wcs === false ? null : wcsFromHeader(h, file);
  const unit = bunit !== null && isMapUnit(bunit) ? bunit : undefined;
  const hdu = { index: layout.index, extname: layout.extname, type: layout.type };
  if (data instanceof Float32Array) {
    const map: SkyMapFloat32 = { data, nx, ny, wcs };
    if (unit !== undefined) map.unit = unit;
    return { map, header: h, hdu, bitpix, bunit, file };
  }
  const map: SkyMap = { data, nx, ny, wcs };
  if (unit !== undefined) map.unit = unit;
  return { map, header: h, hdu, bitpix, bunit, file };
}

/**
 * Read one 2-D image from the FITS file at `path` (`.fits` or gzip-compressed `.fits.gz`, detected by
 * its magic bytes). Pixels are physical values BZERO + BSCALE · stored (FITS 4.0 eq. 3) in float64,
 * NaN for BLANK integers (FITS 4.0 §4.4.2.5) and for NaN floats. With `dtype: "float32"` they are a
 * native-order Float32Array instead (BITPIX −32, 16, 8 only; see {@link decodePixelsFloat32} for the
 * rounding rule). Axes beyond the second must have length 1. Errors: NOT_FOUND (no file), BAD_FITS
 * (not FITS, truncated, bad keywords, no such HDU, not a 2-D image), BAD_DATA (every pixel NaN unless
 * `allowAllNaN`), BAD_WCS (from the WCS parser), BAD_VALUE (`out` too short; float32 asked of a
 * BITPIX it cannot hold).
 */
export async function readFitsImage(path: string, options: ReadFitsFloat32Options): Promise<FitsImage<SkyMapFloat32>>;
export async function readFitsImage(path: string, options?: ReadFitsOptions): Promise<FitsImage>;
export async function readFitsImage(path: string, options?: AnyReadOptions): Promise<AnyFitsImage>;
export async function readFitsImage(path: string, options: AnyReadOptions = {}): Promise<AnyFitsImage> {
  const source = openFitsSource(path);
  try {
    return await readSelected(source, path, options);
  } finally {
    source.close();
  }
}

/** As {@link readFitsImage}, for a FITS file already in memory; `file` names it in errors. */
export async function parseFitsImage(bytes: Uint8Array, file: string, options: ReadFitsFloat32Options): Promise<FitsImage<SkyMapFloat32>>;
export async function parseFitsImage(bytes: Uint8Array, file: string, options?: ReadFitsOptions): Promise<FitsImage>;
export async function parseFitsImage(bytes: Uint8Array, file: string, options?: AnyReadOptions): Promise<AnyFitsImage>;
export async function parseFitsImage(bytes: Uint8Array, file: string, options: AnyReadOptions = {}): Promise<AnyFitsImage> {
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
