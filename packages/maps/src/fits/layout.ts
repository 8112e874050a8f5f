/**
 * The layout of a FITS file: where each header-and-data unit (HDU) starts, what it holds and how
 * many bytes its data occupy, computed from its mandatory keywords so any HDU (image, table, random
 * groups) can be skipped without reading it (FITS 4.0 §4.4.1, eqs. 1–2; IAU FITS Working Group 2016).
 */
import { UmbraError } from "@umbra/core";
import { ascii, BLOCK_BYTES, parseHeaderAt, type FitsHeader } from "./header.js";
import type { ByteSource } from "./source.js";

/** The kind of an HDU. */
export type HduType = "PRIMARY" | "IMAGE" | "BINTABLE" | "TABLE" | "COMPRESSED_IMAGE" | "OTHER";

/** One HDU's place and shape in a file. */
export interface HduLayout {
  /** 0-based position in the file (0 is the primary HDU). */
  index: number;
  type: HduType;
  /** XTENSION as written (empty for the primary HDU). */
  xtension: string;
  /** EXTNAME, or null. */
  extname: string | null;
  header: FitsHeader;
  bitpix: number;
  /** NAXIS1..NAXISn (empty when NAXIS = 0). */
  naxes: number[];
  headerOffset: number;
  dataOffset: number;
  /** Bytes of data, without the padding to the next block. */
  dataBytes: number;
}

const VALID_BITPIX = new Set([8, 16, 32, 64, -32, -64]);

function requireInt(header: FitsHeader, keyword: string, file: string, hdu: number, min: number): number {
  const v = header.get(keyword);
  if (typeof v !== "number" || !Number.isInteger(v) || v < min) {
    const what = v === undefined ? "is missing" : `has value ${String(v)}, not an integer >= ${min}`;
    throw new UmbraError("BAD_FITS", `mandatory keyword ${what}`, { file, hdu, keyword });
  }
  return v;
}

/**
 * Read the mandatory keywords of one header and compute its data size in bytes:
 * |BITPIX|/8 · GCOUNT · (PCOUNT + NAXIS1·…·NAXISn) (FITS 4.0 eq. 2; eq. 1 for a primary array; random
 * groups, NAXIS1 = 0, §6).
 */
function describe(header: FitsHeader, file: string, index: number): Omit<HduLayout, "headerOffset" | "dataOffset"> {
  const first = header.cards[0];
  let type: HduType;
  let xtension = "";
  if (index === 0) {
    if (first === undefined || first.keyword !== "SIMPLE") {
      throw new UmbraError("BAD_FITS", "not a FITS file: the first card is not SIMPLE", { file, hdu: 0, keyword: "SIMPLE" });
    }
    if (first.value !== true) {
      throw new UmbraError("BAD_FITS", "SIMPLE is not T: file does not conform to the FITS standard", { file, hdu: 0, keyword: "SIMPLE" });
    }
    type = "PRIMARY";
  } else {
    if (first === undefined || first.keyword !== "XTENSION" || typeof first.value !== "string") {
      throw new UmbraError("BAD_FITS", "extension header does not start with XTENSION", { file, hdu: index, keyword: "XTENSION" });
    }
    xtension = first.value.trim();
    type = xtension === "IMAGE" ? "IMAGE" : xtension === "BINTABLE" || xtension === "A3DTABLE" ? "BINTABLE" : xtension === "TABLE" ? "TABLE" : "OTHER";
  }
  const bitpix = header.get("BITPIX");
  if (typeof bitpix !== "number" || !VALID_BITPIX.has(bitpix)) {
    throw new UmbraError("BAD_FITS", `unknown BITPIX ${String(bitpix)} (allowed: 8, 16, 32, 64, -32, -64)`, {
      file,
      hdu: index,
      keyword: "BITPIX",
    });
  }
  const naxis = requireInt(header, "NAXIS", file, index, 0);
  if (naxis > 999) throw new UmbraError("BAD_FITS", `NAXIS = ${naxis} exceeds 999`, { file, hdu: index, keyword: "NAXIS" });
  const naxes: number[] = [];
  for (let k = 1; k <= naxis; k++) naxes.push(requireInt(header, `NAXIS${k}`, file, index, 0));
  const pcount = index === 0 && header.get("GROUPS") !== true ? 0 : header.has("PCOUNT") ? requireInt(header, "PCOUNT", file, index, 0) : 0;
  const gcount = index === 0 && header.get("GROUPS") !== true ? 1 : header.has("GCOUNT") ? requireInt(header, "GCOUNT", file, index, 0) : 1;
  let elements = 0;
  if (naxis > 0) {
    const groups = index === 0 && header.get("GROUPS") === true && naxes[0] === 0;
    elements = 1;
    for (let k = groups ? 1 : 0; k < naxis; k++) elements *= naxes[k] as number;
  }
  const dataBytes = (Math.abs(bitpix) / 8) * gcount * (pcount + elements);
  if (!Number.isSafeInteger(dataBytes)) {
    throw new UmbraError("BAD_FITS", `data size from NAXISn is not representable (${dataBytes} bytes)`, { file, hdu: index, keyword: "NAXIS" });
  }
  if (type === "BINTABLE" && header.get("ZIMAGE") === true) type = "COMPRESSED_IMAGE";
  const extnameValue = header.get("EXTNAME");
  const extname = typeof extnameValue === "string" ? extnameValue.trim() : null;
  return { index, type, xtension, extname, header, bitpix, naxes, dataBytes };
}

/**
 * Scan every HDU of a FITS file in `source`: parse each header, compute its data size and skip
 * to the next header. Throws BAD_FITS (naming `file` and the HDU) for a file that is not FITS, a
 * header without END, or data that run past the end of the file (truncated, or NAXISn too large).
 * Bytes after the last HDU that do not start an extension header are ignored, as FITS 4.0 §3.5 allows
 * special records there.
 */
export function scanHdus(source: ByteSource, file: string): HduLayout[] {
  if (source.length < BLOCK_BYTES || ascii(source.read(0, 9)) !== "SIMPLE  =") {
    const why = source.length < BLOCK_BYTES ? `shorter than one 2880-byte block (${source.length} bytes)` : "does not start with 'SIMPLE  ='";
    throw new UmbraError("BAD_FITS", `not a FITS file: ${why}`, { file, hdu: 0 });
  }
  const hdus: HduLayout[] = [];
  let offset = 0;
  while (offset < source.length) {
    if (hdus.length > 0 && ascii(source.read(offset, 8)) !== "XTENSION") break;
    const index = hdus.length;
    const parsed = parseHeaderAt(source, offset, file, index);
    const d = describe(parsed.header, file, index);
    const end = parsed.dataOffset + d.dataBytes;
    if (end > source.length) {
      throw new UmbraError(
        "BAD_FITS",
        `data unit needs ${d.dataBytes} bytes from NAXISn but the file holds only ${Math.max(0, source.length - parsed.dataOffset)} (truncated file?)`,
        { file, hdu: index, keyword: "NAXIS" },
      );
    }
    hdus.push({ ...d, headerOffset: parsed.headerOffset, dataOffset: parsed.dataOffset });
    offset = parsed.dataOffset + Math.ceil(d.dataBytes / BLOCK_BYTES) * BLOCK_BYTES;
  }
  checkTrailing(source, offset, file, hdus.length - 1);
  return hdus;
}

/**
 * Bytes after the last HDU that are not an extension must be fill (zeros or blanks); anything else
 * means the last HDU's NAXISn undercounts its data (or the file is corrupt). FITS 4.0 §3.5 allows
 * "special records" there, which are so rare that we report rather than guess.
 */
function checkTrailing(source: ByteSource, offset: number, file: string, lastHdu: number): void {
  for (let p = offset; p < source.length; p += 1 << 20) {
    const chunk = source.read(p, 1 << 20);
    for (let i = 0; i < chunk.length; i++) {
      const b = chunk[i] as number;
      if (b !== 0 && b !== 32) {
        throw new UmbraError(
          "BAD_FITS",
          `${source.length - offset} bytes after the last HDU are neither an extension nor fill: data size disagrees with NAXISn?`,
          { file, hdu: lastHdu, keyword: "NAXIS" },
        );
      }
    }
  }
}
