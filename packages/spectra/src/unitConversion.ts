/**
 * Map units as reference spectra, and the conversion factor between two units in a band.
 *
 * A map value v in unit U stands for the sky spectrum v·R_U(ν), where (all in MJy/sr per unit):
 * K_CMB: R = dB/dT at T0 (a CMB blackbody fluctuation); µK_CMB: 1e-6 of that; K_RJ: R = 2k_Bν²/c²
 * (Rayleigh–Jeans); MJy/sr: R = ν_ref/ν (the IRAS ν⁻¹ convention, Beichman et al. 1988, IRAS Explanatory Supplement;
 * quoted at the band's reference frequency); Jy/beam: the MJy/sr
 * reference times 1e-6/Ω_beam. A band reads a sky spectrum S as ∫τS dν / ∫τR_U dν.
 */
import { UmbraError, isMapUnit } from "@umbra/core";
import type { MapUnit } from "@umbra/core";
import { bandIntegral, bandReferenceFrequency } from "./bandpass.js";
import { dPlanckdT, rayleighJeansPerK } from "./planck.js";
import type { BandSpec, Spectrum } from "./types.js";

/** Options for units that need the beam: Jy/beam needs the beam solid angle Ω in steradians. */
export interface UnitOptions {
  readonly beamSolidAngleSr?: number;
}

function checkUnit(unit: string, field: string): MapUnit {
  if (!isMapUnit(unit)) {
    throw new UmbraError("BAD_OPTION", `unknown unit '${unit}' (expected K_CMB, uK_CMB, K_RJ, MJy/sr or Jy/beam)`, { field, value: unit });
  }
  return unit;
}

function beamSolidAngle(opts: UnitOptions | undefined): number {
  const omega = opts?.beamSolidAngleSr;
  if (omega === undefined) {
    throw new UmbraError("BAD_OPTION", "Jy/beam needs the beam solid angle (beamSolidAngleSr)", { field: "beamSolidAngleSr" });
  }
  if (!Number.isFinite(omega) || omega <= 0) {
    throw new UmbraError("BAD_VALUE", `beam solid angle ${String(omega)} sr is not positive`, { field: "beamSolidAngleSr", value: omega });
  }
  return omega;
}

/**
 * The reference spectrum R_U(ν) of a unit in MJy/sr per unit value, for a band whose MJy/sr
 * reference frequency is `refFrequencyGHz` (see the module comment for each unit's definition).
 */
export function unitReferenceSpectrum(unit: MapUnit, refFrequencyGHz: number, opts?: UnitOptions): Spectrum {
  switch (checkUnit(unit, "unit")) {
    case "K_CMB":
      return (nu) => dPlanckdT(nu);
    case "uK_CMB":
      return (nu) => 1e-6 * dPlanckdT(nu);
    case "K_RJ":
      return rayleighJeansPerK;
    case "MJy/sr":
      return (nu) => refFrequencyGHz / nu;
    case "Jy/beam": {
      const s = 1e-6 / beamSolidAngle(opts);
      return (nu) => (s * refFrequencyGHz) / nu;
    }
  }
}

/**
 * Band-integrated reference response ∫τ R_U dν of one unit (for a delta band: R_U(ν)), the
 * denominator of every response quoted in `unit`.
 */
export function unitBandResponse(unit: MapUnit, band: BandSpec, opts?: UnitOptions): number {
  const ref = bandReferenceFrequency(band);
  return bandIntegral(band, unitReferenceSpectrum(unit, ref, opts));
}

/**
 * The factor that converts a map value from unit `from` to unit `to` in a band:
 * value_to = factor · value_from, factor = ∫τ R_from dν / ∫τ R_to dν (delta band: R_from(ν)/R_to(ν)).
 * For a delta band K_RJ/K_CMB = x² eˣ/(eˣ − 1)², x = hν/k_BT0 (derivative of Rayleigh–Jeans vs
 * Planck; e.g. Rybicki & Lightman 1979, eqs. 1.51, 1.53). Jy/beam needs `beamSolidAngleSr`.
 */
export function unitConversionFactor(from: MapUnit, to: MapUnit, band: BandSpec, opts?: UnitOptions): number {
  checkUnit(from, "from");
  checkUnit(to, "to");
  if (from === to) {
    bandReferenceFrequency(band); // still validate the band
    return 1;
  }
  return unitBandResponse(from, band, opts) / unitBandResponse(to, band, opts);
}
