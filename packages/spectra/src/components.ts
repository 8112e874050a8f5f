/**
 * Every component's spectrum in MJy/sr per unit amplitude, and its response in a band and unit:
 * response = ∫τ S dν / ∫τ R_U dν (delta band: S(ν)/R_U(ν)), with R_U the unit's reference spectrum
 * (see unitConversion.ts and docs/spectra.md).
 */
import { UmbraError } from "@umbra/core";
import type { MapUnit } from "@umbra/core";
import { bandIntegral, effectiveFrequency } from "./bandpass.js";
import { cibSpectrum, cmbIntensity, dustSpectrum, radioSpectrum } from "./foregrounds.js";
import { kszIntensity } from "./ksz.js";
import { tszIntensity } from "./tsz.js";
import { checkElectronTemperature, tszIntensityRelativistic } from "./tszRelativistic.js";
import { relativisticTszIntensityFast } from "./tszFast.js";
import type { BandSpec, ComponentSpec, Spectrum } from "./types.js";
import { unitBandResponse } from "./unitConversion.js";
import type { UnitOptions } from "./unitConversion.js";

/** Options of {@link componentResponse}. */
export interface ResponseOptions extends UnitOptions {
  /**
   * Relativistic tSZ evaluator: "fast" (default; the tabulated evaluator, within 1e-5 of the exact
   * integral, see tszFast.ts) or "exact" (the integral itself, ~1 ms per frequency).
   */
  readonly tszMethod?: "fast" | "exact";
}

/**
 * The spectrum of a component in MJy/sr per unit amplitude, as a function of ν in GHz:
 * tSZ per unit y (non-relativistic when kTe is absent or 0; Wright 1979 single scattering
 * otherwise), kSZ per unit τv/c, CMB per K_CMB, dust/CIB/radio per MJy/sr at their reference
 * frequency. Parameters are validated (BAD_VALUE naming the field).
 */
export function componentSpectrum(component: ComponentSpec, opts: ResponseOptions = {}): Spectrum {
  switch (component.kind) {
    case "tsz": {
      const kte = component.kTeKeV ?? 0;
      checkElectronTemperature(kte);
      if (kte === 0) return tszIntensity;
      if (opts.tszMethod === "exact") return (nu) => tszIntensityRelativistic(nu, kte);
      return (nu) => relativisticTszIntensityFast(nu, kte);
    }
    case "ksz":
      return kszIntensity;
    case "cmb":
      return cmbIntensity;
    case "dust":
      return dustSpectrum(component.beta, component.temperatureK, component.refFrequencyGHz);
    case "cib":
      return cibSpectrum(component.beta, component.temperatureK, component.redshift ?? 0, component.refFrequencyGHz);
    case "radio":
      return radioSpectrum(component.alpha, component.refFrequencyGHz);
    default: {
      const kind: unknown = (component as { kind?: unknown }).kind;
      throw new UmbraError("BAD_OPTION", `unknown component '${String(kind)}' (expected tsz, ksz, cmb, dust, cib or radio)`, {
        field: "kind",
        value: kind,
      });
    }
  }
}

/**
 * Response of a band, in map unit `unit`, to one unit of a component's amplitude:
 * ∫τ S dν / ∫τ R_U dν (delta band: S(ν)/R_U(ν)). E.g. tSZ at a 150 GHz delta band in K_CMB is
 * T0 (x coth(x/2) − 4) ≈ −2.59 K per unit y; CMB in K_CMB is exactly 1. Jy/beam needs
 * `beamSolidAngleSr`. Conventions: docs/spectra.md.
 */
export function componentResponse(component: ComponentSpec, band: BandSpec, unit: MapUnit, opts: ResponseOptions = {}): number {
  const s = componentSpectrum(component, opts);
  return bandIntegral(band, s) / unitBandResponse(unit, band, opts);
}

/**
 * Effective frequency of a component in a band, ∫τνS dν / ∫τS dν in GHz (common practice, no
 * source); a delta band returns its own frequency.
 */
export function componentEffectiveFrequency(component: ComponentSpec, band: BandSpec, opts: ResponseOptions = {}): number {
  return effectiveFrequency(band, componentSpectrum(component, opts));
}
