/**
 * The M500–T relation of Arnaud, Pointecouteau & Pratt 2005 (A&A 441, 893; whole sample, slope
 * 1.71 ± 0.09 as in their abstract), with the normalisation log10 C = 14.580 ± 0.016 as restated
 * in Arnaud, Pointecouteau & Pratt 2007 (A&A 474, L37, Table 2, "the same as that given in
 * Arnaud et al. 2005"):
 *   E(z) M500 = 10^14.580 (kT / 5 keV)^1.71 h70^−1 M☉.
 * Used to give a kTe for the relativistic tSZ correction when none is measured.
 */
import { requireFinite } from "@umbra/core";
import { requireMass } from "../cosmology/overdensity.js";
import { requireRedshift } from "../cosmology/create.js";
import type { Cosmology } from "../cosmology/types.js";

const LOG_C = 14.58;
const SLOPE = 1.71;

/** kT in keV of a cluster of mass M500 (M☉) at z, inverting the APP05 M500–T relation. */
export function temperatureFromMassKeV(m500Msun: number, z: number, cosmo: Cosmology): number {
  requireMass(m500Msun);
  requireRedshift(z);
  return 5 * ((cosmo.efunc(z) * m500Msun * cosmo.h70) / 10 ** LOG_C) ** (1 / SLOPE);
}

/** M500 in M☉ of a cluster of temperature kT (keV) at z by the APP05 M500–T relation. */
export function massFromTemperatureMsun(kTKeV: number, z: number, cosmo: Cosmology): number {
  requireFinite("kTKeV", kTKeV, (v) => v > 0, "not a positive temperature");
  requireRedshift(z);
  return (10 ** LOG_C * (kTKeV / 5) ** SLOPE) / (cosmo.efunc(z) * cosmo.h70);
}
