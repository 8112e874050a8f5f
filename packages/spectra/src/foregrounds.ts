/**
 * Foreground spectra in MJy/sr per unit amplitude, each normalised at a reference frequency the
 * caller chooses: primary CMB (a blackbody fluctuation, flat in K_CMB), modified-blackbody dust
 * I ∝ ν^β B_ν(T_d) (Hildebrand 1983, QJRAS 24, 267), a CIB-like modified blackbody from galaxies at
 * an effective redshift, and a radio power law S ∝ ν^α.
 */
import { UmbraError } from "@umbra/core";
import { dPlanckdT, planckIntensity } from "./planck.js";

function positive(name: string, v: number): number {
  if (!Number.isFinite(v) || v <= 0) throw new UmbraError("BAD_VALUE", `${name} = ${String(v)} must be a positive finite number`, { field: name, value: v });
  return v;
}
function finite(name: string, v: number): number {
  if (!Number.isFinite(v)) throw new UmbraError("BAD_VALUE", `${name} = ${String(v)} is not a finite number`, { field: name, value: v });
  return v;
}

/** Primary CMB anisotropy intensity per K_CMB in MJy/sr at ν (GHz): dB/dT at T0 (Fixsen 2009, ApJ 707, 916 for T0). */
export function cmbIntensity(frequencyGHz: number): number {
  return dPlanckdT(frequencyGHz);
}

/**
 * Modified-blackbody dust intensity per MJy/sr at the reference frequency ν0:
 * I(ν)/I(ν0) = (ν/ν0)^β B_ν(T_d)/B_ν0(T_d) (Hildebrand 1983, QJRAS 24, 267; optically thin).
 * Returns a function of ν in GHz; β dimensionless, T_d in K, ν0 in GHz.
 */
export function dustSpectrum(beta: number, temperatureK: number, refFrequencyGHz: number): (frequencyGHz: number) => number {
  finite("beta", beta);
  positive("temperatureK", temperatureK);
  positive("refFrequencyGHz", refFrequencyGHz);
  const b0 = planckIntensity(refFrequencyGHz, temperatureK);
  if (!(b0 > 0)) throw new UmbraError("BAD_VALUE", `dust blackbody underflows at ${refFrequencyGHz} GHz for T_d = ${temperatureK} K`, { field: "temperatureK" });
  return (nu) => Math.pow(nu / refFrequencyGHz, beta) * (planckIntensity(nu, temperatureK) / b0);
}

/**
 * CIB-like spectrum per MJy/sr at ν0: a modified blackbody of rest-frame temperature T_d emitted at
 * effective redshift z, observed as (ν(1+z))^β B_{ν(1+z)}(T_d) ∝ ν^β B_ν(T_d/(1+z)) up to a constant
 * (common practice, no source).
 */
export function cibSpectrum(beta: number, temperatureK: number, redshift: number, refFrequencyGHz: number): (frequencyGHz: number) => number {
  if (!Number.isFinite(redshift) || redshift < 0) throw new UmbraError("BAD_VALUE", `redshift = ${String(redshift)} must be ≥ 0`, { field: "redshift", value: redshift });
  return dustSpectrum(beta, positive("temperatureK", temperatureK) / (1 + redshift), refFrequencyGHz);
}

/**
 * Radio power law per MJy/sr at ν0: I(ν)/I(ν0) = (ν/ν0)^α (flux density S ∝ ν^α for a source of
 * fixed solid angle; common practice, no source).
 */
export function radioSpectrum(alpha: number, refFrequencyGHz: number): (frequencyGHz: number) => number {
  finite("alpha", alpha);
  positive("refFrequencyGHz", refFrequencyGHz);
  return (nu) => Math.pow(nu / refFrequencyGHz, alpha);
}
