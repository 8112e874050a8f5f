/**
 * One band of a simulated field as a FITS image (the maps package's writer: BITPIX −64, WCS in
 * CD-matrix style, BUNIT, atomic write) with the simulator's descriptive cards and a provenance
 * block without a creation time, so the same seed gives the same bytes.
 */
import { writeFits, type FitsImageHdu, type Provenance } from "@umbra/maps";
import type { SimulatedBand, SimulatedField } from "../sky/simulate.js";

/** Header cards a simulated band carries besides WCS and BUNIT (field, band, beam, seed, scenario). */
export function simulatedBandCards(field: SimulatedField, band: SimulatedBand): NonNullable<FitsImageHdu["cards"]> {
  return [
    { keyword: "ORIGIN", value: "umbra simulate", comment: "simulated sky" },
    { keyword: "OBJECT", value: field.scenario.field.fieldId, comment: "invented field name" },
    { keyword: "BANDNAME", value: band.name, comment: "band name in the manifest" },
    ...(band.frequencyGHz !== null ? [{ keyword: "FREQGHZ", value: band.frequencyGHz, comment: "[GHz] band frequency" }] : []),
    { keyword: "BEAMFWHM", value: band.beamFwhmArcmin, comment: "[arcmin] Gaussian beam FWHM" },
    { keyword: "SIMSEED", value: field.seed, comment: "seed of the simulation" },
    { keyword: "SCENARIO", value: field.scenario.name.slice(0, 60), comment: "scenario name" },
  ];
}

/** The FITS image of one band's map (`kind` "map") or inverse-variance map ("ivar"). */
export function bandFitsHdu(field: SimulatedField, band: SimulatedBand, kind: "map" | "ivar"): FitsImageHdu {
  const data = kind === "map" ? band.map : band.ivar;
  if (!data) throw new RangeError(`band ${band.name} has no ${kind}`);
  return {
    data,
    nx: field.geometry.nx,
    ny: field.geometry.ny,
    bitpix: -64,
    wcs: field.wcs,
    bunit: kind === "map" ? band.unit : `(${band.unit})-2`,
    cards: simulatedBandCards(field, band),
  };
}

/** Write one band's map or inverse-variance map as FITS, atomically, with `provenance`. */
export async function writeBandFits(path: string, field: SimulatedField, band: SimulatedBand, kind: "map" | "ivar", provenance: Provenance): Promise<void> {
  await writeFits(path, [bandFitsHdu(field, band, kind)], { provenance });
}
