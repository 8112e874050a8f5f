/**
 * Writing float images to FITS: a primary HDU and optional IMAGE extensions (FITS 4.0 §4.4.1, §7.1;
 * IAU FITS Working Group 2016), each with its WCS (CD-matrix style, Greisen & Calabretta 2002 §2.1.2),
 * BUNIT, EXTNAME and a provenance block, big-endian IEEE data (§5.3) padded to 2880-byte blocks (§3.1).
 * Files are written atomically.
 */
import { UmbraError } from "@umbra/core";
import { writeFileAtomic } from "../io/atomic.js";
import { stableJson, type Provenance } from "../io/provenance.js";
import type { SkyMap } from "../types.js";
import type { Wcs } from "../wcs/types.js";
import { wcsToHeaderCards } from "../wcs/cards.js";
import { formatCard, type CardInput } from "./format.js";
import { BLOCK_BYTES, CARD_BYTES } from "./header.js";

/** One image to write. */
export interface FitsImageHdu {
  /** Pixels, row-major, x fastest (length nx·ny); NaN allowed (IEEE NaN marks undefined pixels, FITS 4.0 §5.3). */
  data: Float64Array | Float32Array;
  nx: number;
  ny: number;
  /** −64 (default for Float64Array) or −32 (default for Float32Array). */
  bitpix?: -32 | -64;
  wcs?: Wcs | null;
  /** BUNIT value, e.g. "K_CMB". */
  bunit?: string;
  /** EXTNAME (required to find extensions by name; optional on the primary). */
  extname?: string;
  /** Further cards, written after the WCS. */
  cards?: CardInput[];
}

/** Options for {@link encodeFits} / {@link writeFits}. */
export interface WriteFitsOptions {
  /** Provenance block written into the primary header. */
  provenance?: Provenance;
}

/** Keywords the writer sets itself; callers may not pass them in `cards`. */
const RESERVED = new Set(["SIMPLE", "XTENSION", "BITPIX", "NAXIS", "NAXIS1", "NAXIS2", "EXTEND", "PCOUNT", "GCOUNT", "END", "EXTNAME", "BUNIT", "BSCALE", "BZERO", "BLANK"]);

/**
 * Header cards of the provenance block: a COMMENT line, then PROVTOOL, PROVVERS, PROVDATE (if set),
 * PROVSETS (settings as sorted-key JSON, CONTINUE'd when long), and per input PRVINnnn (name) and
 * PRVSHnnn (SHA-256). Our own short keywords (no HIERARCH), at most 999 inputs.
 */
export function provenanceCards(p: Provenance): CardInput[] {
  // FITS header strings are printable ASCII only (FITS 4.0 §4.2.1): settings JSON and file names
  // keep any other character as a JSON \uXXXX escape, which JSON.parse reads back unchanged.
  if (p.inputs.length > 999) throw new UmbraError("BAD_VALUE", `provenance lists ${p.inputs.length} inputs; at most 999 fit the PRVINnnn keywords`, { field: "inputs" });
  const cards: CardInput[] = [
    { commentary: "COMMENT", text: "umbra provenance: tool, version, settings (JSON), inputs with SHA-256" },
    { keyword: "PROVTOOL", value: p.tool, comment: "software that wrote this file" },
    { keyword: "PROVVERS", value: p.version, comment: "its version" },
  ];
  if (p.createdUtc !== undefined) cards.push({ keyword: "PROVDATE", value: p.createdUtc, comment: "UTC creation time" });
  cards.push({ keyword: "PROVSETS", value: asciiEscape(stableJson(p.settings)), comment: "settings (JSON)" });
  p.inputs.forEach((inp, i) => {
    const n = String(i + 1).padStart(3, "0");
    cards.push({ keyword: `PRVIN${n}`, value: asciiEscape(inp.file), comment: "input file" });
    cards.push({ keyword: `PRVSH${n}`, value: inp.sha256, comment: "SHA-256 of the input" });
  });
  return cards;
}

/** Replace every character outside printable ASCII by its JSON escape \\uXXXX (UTF-16 code units). */
export function asciiEscape(text: string): string {
  return text.replace(/[^\x20-\x7e]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`);
}

const REAL_WCS = /^(CRPIX|CRVAL|CD|CDELT|PC|PV|LONPOLE|LATPOLE|EQUINOX)/;

function headerCards(hdu: FitsImageHdu, index: number, bitpix: number, extraPrimary: CardInput[]): string[] {
  const cards: CardInput[] = [];
  if (index === 0) cards.push({ keyword: "SIMPLE", value: true, comment: "conforms to FITS standard" });
  else cards.push({ keyword: "XTENSION", value: "IMAGE", comment: "image extension" });
  cards.push(
    { keyword: "BITPIX", value: bitpix, comment: "IEEE floating point" },
    { keyword: "NAXIS", value: 2, comment: "number of array dimensions" },
    { keyword: "NAXIS1", value: hdu.nx, comment: "pixels along x" },
    { keyword: "NAXIS2", value: hdu.ny, comment: "pixels along y" },
  );
  if (index === 0) cards.push({ keyword: "EXTEND", value: true, comment: "file may contain extensions" });
  else cards.push({ keyword: "PCOUNT", value: 0, comment: "no parameters" }, { keyword: "GCOUNT", value: 1, comment: "one group" });
  if (hdu.extname !== undefined) cards.push({ keyword: "EXTNAME", value: hdu.extname, comment: "extension name" });
  if (hdu.bunit !== undefined) cards.push({ keyword: "BUNIT", value: hdu.bunit, comment: "unit of the pixel values" });
  if (hdu.wcs != null) {
    for (const c of wcsToHeaderCards(hdu.wcs)) cards.push({ keyword: c.keyword, value: c.value, comment: c.comment, real: REAL_WCS.test(c.keyword) });
  }
  for (const c of hdu.cards ?? []) {
    if (!("commentary" in c) && RESERVED.has(c.keyword)) {
      throw new UmbraError("BAD_VALUE", `keyword ${c.keyword} is set by the writer and cannot be given as an extra card`, { keyword: c.keyword, hdu: index });
    }
    cards.push(c);
  }
  cards.push(...extraPrimary);
  const lines: string[] = [];
  for (const c of cards) lines.push(...formatCard(c));
  lines.push("END".padEnd(CARD_BYTES, " "));
  return lines;
}

function checkHdu(hdu: FitsImageHdu, index: number): -32 | -64 {
  if (!Number.isInteger(hdu.nx) || !Number.isInteger(hdu.ny) || hdu.nx < 1 || hdu.ny < 1) {
    throw new UmbraError("BAD_VALUE", `image shape ${hdu.nx} × ${hdu.ny} is not positive integers`, { hdu: index, field: "nx" });
  }
  if (hdu.data.length !== hdu.nx * hdu.ny) {
    throw new UmbraError("BAD_VALUE", `data length ${hdu.data.length} differs from nx·ny = ${hdu.nx * hdu.ny}`, { hdu: index, field: "data" });
  }
  const bitpix = hdu.bitpix ?? (hdu.data instanceof Float32Array ? -32 : -64);
  if (bitpix !== -32 && bitpix !== -64) throw new UmbraError("BAD_VALUE", `BITPIX ${String(bitpix)}: only −32 and −64 are written`, { hdu: index, keyword: "BITPIX" });
  if (index > 0 && hdu.extname === undefined) {
    throw new UmbraError("BAD_VALUE", "an image extension needs an EXTNAME", { hdu: index, keyword: "EXTNAME" });
  }
  return bitpix;
}

function padded(n: number): number {
  return Math.ceil(n / BLOCK_BYTES) * BLOCK_BYTES;
}

/**
 * Encode images as the bytes of one FITS file: `hdus[0]` the primary HDU, the rest IMAGE extensions.
 * Headers are space-padded and data zero-padded to 2880-byte blocks (FITS 4.0 §3.1, §3.3.2).
 * Throws BAD_VALUE for bad shapes, keywords, strings or non-finite header values.
 */
export function encodeFits(hdus: readonly FitsImageHdu[], options: WriteFitsOptions = {}): Uint8Array {
  if (hdus.length === 0) throw new UmbraError("BAD_VALUE", "nothing to write: no image HDU given", { field: "hdus" });
  const parts: { header: string; hdu: FitsImageHdu; bitpix: -32 | -64 }[] = [];
  let total = 0;
  hdus.forEach((hdu, i) => {
    const bitpix = checkHdu(hdu, i);
    const extra = i === 0 && options.provenance !== undefined ? provenanceCards(options.provenance) : [];
    const header = headerCards(hdu, i, bitpix, extra).join("");
    parts.push({ header, hdu, bitpix });
    total += padded(header.length) + padded((Math.abs(bitpix) / 8) * hdu.data.length);
  });
  const out = new Uint8Array(total);
  let pos = 0;
  for (const { header, hdu, bitpix } of parts) {
    const hb = padded(header.length);
    out.fill(32, pos, pos + hb);
    out.set(Buffer.from(header, "latin1"), pos);
    pos += hb;
    const n = hdu.data.length;
    const bytes = (Math.abs(bitpix) / 8) * n;
    const dest = out.subarray(pos, pos + bytes);
    if (bitpix === -64) {
      new Float64Array(dest.buffer, dest.byteOffset, n).set(hdu.data);
      Buffer.from(dest.buffer, dest.byteOffset, bytes).swap64();
    } else {
      new Float32Array(dest.buffer, dest.byteOffset, n).set(hdu.data);
      Buffer.from(dest.buffer, dest.byteOffset, bytes).swap32();
    }
    pos += padded(bytes);
  }
  return out;
}

/** Encode `hdus` (see {@link encodeFits}) and write them to `path` atomically (temporary file + rename). */
export async function writeFits(path: string, hdus: readonly FitsImageHdu[], options: WriteFitsOptions = {}): Promise<void> {
  await writeFileAtomic(path, encodeFits(hdus, options));
}

/** Write one {@link SkyMap} as a single-image FITS file (float64 unless `bitpix` −32), atomically. */
export async function writeSkyMapFits(
  path: string,
  map: SkyMap,
  options: WriteFitsOptions & { bitpix?: -32 | -64; bunit?: string; extname?: string; cards?: CardInput[] } = {},
): Promise<void> {
  const hdu: FitsImageHdu = { data: map.data, nx: map.nx, ny: map.ny, wcs: map.wcs };
  if (options.bitpix !== undefined) hdu.bitpix = options.bitpix;
  const bunit = options.bunit ?? map.unit;
  if (bunit !== undefined) hdu.bunit = bunit;
  if (options.extname !== undefined) hdu.extname = options.extname;
  if (options.cards !== undefined) hdu.cards = options.cards;
  await writeFits(path, [hdu], options.provenance === undefined ? {} : { provenance: options.provenance });
}
