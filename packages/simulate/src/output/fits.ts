/**
 * A minimal FITS image writer for simulated maps: one primary HDU, BITPIX = −64 (IEEE double,
 * big-endian), NAXIS = 2, the WCS cards of @umbra/maps, BUNIT and a few descriptive keywords.
 * Mandatory keywords in fixed format, headers and data padded to 2880-byte blocks (FITS 4.0,
 * IAU FITS Working Group 2016, §§3.3, 4.1–4.4, 5.3).
 *
 * Why here: @umbra/maps reads FITS but had no image writer when the simulator needed one; this
 * writes only what the simulator produces. It should give way to the maps package's writer once
 * that exists (see docs/simulation.md).
 */
import { writeTextAtomic, wcsToHeaderCards, type Wcs } from "@umbra/maps";
import type { SimulatedBand, SimulatedField } from "../sky/simulate.js";

/** One header card to write. */
export interface OutCard {
  keyword: string;
  value: string | number | boolean;
  comment?: string;
}

function formatValue(v: string | number | boolean): string {
  if (typeof v === "boolean") return (v ? "T" : "F").padStart(20);
  if (typeof v === "string") {
    const s = `'${v.replace(/'/g, "''").padEnd(8)}'`;
    return s.length < 20 ? s.padEnd(20) : s;
  }
  if (!Number.isFinite(v)) throw new RangeError(`FITS header values must be finite, got ${v}`);
  let s: string;
  if (Number.isInteger(v) && Math.abs(v) < 1e15) s = String(v);
  else {
    s = String(v).toUpperCase();
    if (!/[.E]/.test(s)) s = `${s}.0`;
    if (/E/.test(s) && !/\./.test(s.split("E")[0]!)) s = s.replace("E", ".0E"); // FITS reals carry a decimal point
  }
  return s.padStart(20); // right-justified to column 30 when it fits (fixed format, FITS 4.0 §4.2.4)
}

/** One 80-character card (keyword padded to 8, "= ", value, " / comment"). */
export function formatCard(c: OutCard): string {
  if (!/^[A-Z0-9_-]{1,8}$/.test(c.keyword)) throw new RangeError(`invalid FITS keyword '${c.keyword}'`);
  let card = `${c.keyword.padEnd(8)}= ${formatValue(c.value)}`;
  if (c.comment) card += ` / ${c.comment}`;
  if (card.length > 80) card = card.slice(0, 80);
  if (!/^[\x20-\x7e]*$/.test(card)) throw new RangeError(`non-ASCII text in FITS card '${c.keyword}'`);
  return card.padEnd(80);
}

/**
 * Encode a 2-D float64 image (`nx` × `ny`, row-major, x fastest) with the given extra cards into
 * FITS bytes.
 */
export function encodeFitsImage(data: Float64Array, nx: number, ny: number, cards: readonly OutCard[]): Uint8Array {
  if (data.length !== nx * ny) throw new RangeError(`image has ${data.length} values, expected ${nx}×${ny}`);
  const head: string[] = [
    formatCard({ keyword: "SIMPLE", value: true, comment: "conforms to FITS 4.0" }),
    formatCard({ keyword: "BITPIX", value: -64, comment: "IEEE double precision" }),
    formatCard({ keyword: "NAXIS", value: 2 }),
    formatCard({ keyword: "NAXIS1", value: nx }),
    formatCard({ keyword: "NAXIS2", value: ny }),
    ...cards.map(formatCard),
    "END".padEnd(80),
  ];
  const headerText = head.join("");
  const headerBytes = Math.ceil(headerText.length / 2880) * 2880;
  const dataBytes = Math.ceil((data.length * 8) / 2880) * 2880;
  const out = new Uint8Array(headerBytes + dataBytes);
  out.fill(0x20, 0, headerBytes);
  for (let i = 0; i < headerText.length; i++) out[i] = headerText.charCodeAt(i);
  const view = new DataView(out.buffer, headerBytes, dataBytes);
  for (let i = 0; i < data.length; i++) view.setFloat64(8 * i, data[i]!, false);
  return out;
}

function wcsCards(wcs: Wcs): OutCard[] {
  return wcsToHeaderCards(wcs).map((c) => ({ keyword: c.keyword, value: c.value, comment: c.comment }));
}

/** Write one band's map (`kind` "map") or inverse-variance map ("ivar") as FITS, atomically. */
export async function writeBandFits(path: string, field: SimulatedField, band: SimulatedBand, kind: "map" | "ivar"): Promise<void> {
  const data = kind === "map" ? band.map : band.ivar;
  if (!data) throw new RangeError(`band ${band.name} has no ${kind}`);
  const unit = kind === "map" ? band.unit : `(${band.unit})-2`;
  const cards: OutCard[] = [
    ...wcsCards(field.wcs),
    { keyword: "BUNIT", value: unit, comment: kind === "map" ? "map unit" : "inverse variance of the white noise" },
    { keyword: "ORIGIN", value: "umbra simulate", comment: "simulated sky" },
    { keyword: "OBJECT", value: field.scenario.field.fieldId, comment: "invented field name" },
    { keyword: "BANDNAME", value: band.name },
    ...(band.frequencyGHz !== null ? [{ keyword: "FREQGHZ", value: band.frequencyGHz, comment: "[GHz] band frequency" }] : []),
    { keyword: "BEAMFWHM", value: band.beamFwhmArcmin, comment: "[arcmin] Gaussian beam FWHM" },
    { keyword: "SIMSEED", value: field.seed, comment: "seed of the simulation" },
    { keyword: "SCENARIO", value: field.scenario.name.slice(0, 60), comment: "scenario name" },
  ];
  await writeTextAtomic(path, encodeFitsImage(data, field.geometry.nx, field.geometry.ny, cards));
}
