/**
 * `umbra inspect FILE...`: describe every HDU of FITS files — type, shape, BITPIX, BUNIT, a WCS
 * summary (projection, CRVAL, sky position of the image centre, pixel and field size) and pixel
 * statistics (min, max, mean, standard deviation, NaN count) — as text or, with --json, as
 * `{"files":[{"file", "hdus":[...]}]}` (always the `files` array, also for one file).
 *
 * A file that cannot be read gives one line on stderr naming it; the others are still described, and
 * the exit code is 2. A problem confined to one HDU (a 3-D cube, a broken WCS) is reported in that
 * HDU's entry without failing the file.
 */
import type { Command } from "commander";
import { isUmbraError, type UmbraError } from "@umbra/core";
import { openFitsSource, pixelToWorld, readFitsImageFromSource, scanHdus, wcsFromHeader, type ByteSource, type HduLayout, type Wcs } from "@umbra/maps";

/** WCS summary of one image HDU. */
export interface InspectWcs {
  projection: string;
  /** RADESYS frame, or GALACTIC: says what the centre's longitude/latitude are. */
  frame: string;
  crval_deg: [number, number];
  /** Longitude / latitude (RA / Dec for equatorial frames) of the image centre, pixel ((nx−1)/2, (ny−1)/2). */
  center_ra_deg: number;
  center_dec_deg: number;
  /** Pixel side along x and y: lengths of the CD matrix columns, in arcmin. */
  pixel_arcmin: [number, number];
  /** nx · pixel_x and ny · pixel_y in degrees. */
  field_deg: [number, number];
}

/** Statistics of the finite pixels (population standard deviation, ddof = 0). */
export interface InspectStats {
  min: number | null;
  max: number | null;
  mean: number | null;
  std: number | null;
  nan_count: number;
}

/** One HDU as reported. */
export interface InspectHdu {
  index: number;
  extname: string | null;
  /** PRIMARY, IMAGE, COMPRESSED_IMAGE, BINTABLE, TABLE or OTHER. */
  type: string;
  /** NAXIS1..n (ZNAXIS1..n for a compressed image), FITS order (x first). */
  shape: number[];
  bitpix: number;
  unit: string | null;
  wcs: InspectWcs | null;
  stats: InspectStats | null;
  /** Why the image could not be summarised, when it could not. */
  error?: string;
}

/** Statistics of `data`: min, max, mean and std over non-NaN values (two passes), and the NaN count. */
export function pixelStats(data: Float64Array): InspectStats {
  let n = 0;
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < data.length; i++) {
    const v = data[i] as number;
    if (Number.isNaN(v)) continue;
    n++;
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (n === 0) return { min: null, max: null, mean: null, std: null, nan_count: data.length };
  const mean = sum / n;
  let ss = 0;
  for (let i = 0; i < data.length; i++) {
    const v = data[i] as number;
    if (!Number.isNaN(v)) ss += (v - mean) * (v - mean);
  }
  return { min, max, mean, std: Math.sqrt(ss / n), nan_count: data.length - n };
}

/** WCS summary for an nx × ny image; pixel sides from the CD columns (Greisen & Calabretta 2002 §2.1). */
export function wcsSummary(wcs: Wcs, nx: number, ny: number): InspectWcs {
  const centre = pixelToWorld(wcs, (nx - 1) / 2, (ny - 1) / 2);
  const [c11, c12, c21, c22] = wcs.cd;
  const dxDeg = Math.hypot(c11, c21);
  const dyDeg = Math.hypot(c12, c22);
  return {
    projection: wcs.projection,
    frame: wcs.radesys,
    crval_deg: [wcs.crval[0], wcs.crval[1]],
    center_ra_deg: centre.lonDeg,
    center_dec_deg: centre.latDeg,
    pixel_arcmin: [dxDeg * 60, dyDeg * 60],
    field_deg: [nx * dxDeg, ny * dyDeg],
  };
}

async function describeHdu(source: ByteSource, file: string, h: HduLayout): Promise<InspectHdu> {
  const bunit = h.header.get("BUNIT");
  const isCompressed = h.type === "COMPRESSED_IMAGE";
  const zshape: number[] = [];
  if (isCompressed) for (let k = 1; typeof h.header.get(`ZNAXIS${k}`) === "number"; k++) zshape.push(h.header.get(`ZNAXIS${k}`) as number);
  const entry: InspectHdu = {
    index: h.index,
    extname: h.extname,
    type: h.type,
    shape: isCompressed ? zshape : h.naxes,
    bitpix: isCompressed && typeof h.header.get("ZBITPIX") === "number" ? (h.header.get("ZBITPIX") as number) : h.bitpix,
    unit: typeof bunit === "string" ? bunit.trim() : null,
    wcs: null,
    stats: null,
  };
  const isImage = h.type === "PRIMARY" || h.type === "IMAGE" || isCompressed;
  if (!isImage || entry.shape.length === 0) return entry;
  try {
    const img = await readFitsImageFromSource(source, file, { hdu: h.index, allowAllNaN: true, wcs: false });
    entry.stats = pixelStats(img.map.data);
    if (h.header.has("CTYPE1") || h.header.has("CTYPE2")) entry.wcs = wcsSummary(wcsFromHeader(h.header, file), img.map.nx, img.map.ny);
  } catch (e) {
    if (!isUmbraError(e)) throw e;
    entry.error = e.message;
  }
  return entry;
}

function fmt(x: number | null, digits = 6): string {
  if (x === null) return "—";
  return Math.abs(x) >= 1e5 || (x !== 0 && Math.abs(x) < 1e-3) ? x.toExponential(digits - 1) : x.toFixed(digits);
}

function textFor(file: string, hdus: InspectHdu[]): string {
  const lines = [file];
  for (const h of hdus) {
    const name = h.extname === null ? "" : ` '${h.extname}'`;
    const table = (h.type === "BINTABLE" || h.type === "TABLE") && h.shape.length === 2;
    const shape = h.shape.length === 0 ? "no data" : table ? `${h.shape[1]} rows of ${h.shape[0]} bytes` : h.shape.join(" × ");
    lines.push(`  HDU ${h.index}  ${h.type}${name}  ${shape}  BITPIX ${h.bitpix}${h.unit !== null ? `  unit ${h.unit === "" ? "(blank)" : h.unit}` : ""}`);
    if (h.wcs !== null) {
      const w = h.wcs;
      lines.push(
        `    WCS ${w.projection} ${w.frame}  CRVAL (${fmt(w.crval_deg[0])}, ${fmt(w.crval_deg[1])}) deg  centre (${fmt(w.center_ra_deg)}, ${fmt(w.center_dec_deg)}) deg`,
        `    pixel ${fmt(w.pixel_arcmin[0], 4)} × ${fmt(w.pixel_arcmin[1], 4)} arcmin  field ${fmt(w.field_deg[0], 4)} × ${fmt(w.field_deg[1], 4)} deg`,
      );
    }
    if (h.stats !== null) {
      const s = h.stats;
      lines.push(`    min ${fmt(s.min)}  max ${fmt(s.max)}  mean ${fmt(s.mean)}  std ${fmt(s.std)}  NaN ${s.nan_count}`);
    }
    if (h.error !== undefined) lines.push(`    not summarised: ${h.error}`);
  }
  return `${lines.join("\n")}\n`;
}

/** Inspect one file: every HDU described, or the UmbraError that stopped it. */
export async function inspectFile(file: string): Promise<{ file: string; hdus: InspectHdu[] } | { file: string; error: UmbraError }> {
  try {
    // one open file (or one gunzipped copy) serves every HDU
    const source = openFitsSource(file);
    try {
      const hdus: InspectHdu[] = [];
      for (const h of scanHdus(source, file)) hdus.push(await describeHdu(source, file, h));
      return { file, hdus };
    } finally {
      source.close();
    }
  } catch (e) {
    if (isUmbraError(e)) return { file, error: e };
    throw e;
  }
}

/** JSON numbers cannot be NaN or infinite: write those as null. */
function finiteOrNull(_key: string, v: unknown): unknown {
  return typeof v === "number" && !Number.isFinite(v) ? null : v;
}

/** Add `umbra inspect` to `program`. */
export function register(program: Command): void {
  program
    .command("inspect")
    .description("describe the HDUs of FITS files: shape, BITPIX, unit, WCS summary and pixel statistics")
    .argument("<files...>", "FITS files (.fits or .fits.gz)")
    .option("--json", "print JSON: {\"files\":[{\"file\",\"hdus\":[...]}]}")
    .action(async (files: string[], opts: { json?: boolean }) => {
      const results = [];
      let failed = false;
      for (const f of files) {
        const r = await inspectFile(f);
        if ("error" in r) {
          failed = true;
          process.stderr.write(`umbra: ${r.error.message}\n`);
        } else if (opts.json !== true) process.stdout.write(textFor(r.file, r.hdus));
        results.push("error" in r ? { file: r.file, error: { code: r.error.code, message: r.error.message } } : r);
      }
      if (opts.json === true) process.stdout.write(`${JSON.stringify({ files: results }, finiteOrNull, 1)}\n`);
      if (failed) process.exitCode = 2;
    });
}
