/**
 * Band-integrated relativistic tSZ as a function of electron temperature, for inner loops over many
 * clusters: because the fast table is linear in its coefficients, the band response
 *   R(θ) = Σ_q A_q [Y0(x_q) + θ Q(x_q, θ)],  A_q = w_q I0 G(x_q) / ∫τ R_U dν
 * (quadrature points q of the band, see bandpass.ts) collapses to one Chebyshev series in θ per
 * band, evaluated in ~20 multiply-adds. Same physics and accuracy as the fast evaluator
 * (Wright 1979, ApJ 232, 348, tabulated); the exact integral is used above the table's kTe range.
 */
import type { MapUnit } from "@umbra/core";
import { bandQuadrature, bandReferenceFrequency, isBandpassBand } from "./bandpass.js";
import { componentResponse } from "./components.js";
import { thetaFromKeV } from "./constants.js";
import { blackbodyDerivativeShape, cmbIntensityScale, dimensionlessFrequency } from "./planck.js";
import { tszShape } from "./tsz.js";
import { defaultFastRelativisticTsz } from "./tszFast.js";
import { checkElectronTemperature } from "./tszRelativistic.js";
import type { BandSpec } from "./types.js";
import { unitBandResponse } from "./unitConversion.js";
import type { UnitOptions } from "./unitConversion.js";

/** The tSZ response of one band in one unit per unit y, as a function of kTe. */
export interface TszBandResponse {
  /** Response per unit y at kTe (keV) in the chosen unit (kTe = 0: Kompaneets). */
  response(kTeKeV: number): number;
  /** Responses for many temperatures; writes into and returns `out`. */
  responseMany(kTeKeV: Float64Array, out?: Float64Array): Float64Array;
}

/**
 * Precompute the tSZ response of `band` in `unit` per unit y as a function of kTe (keV), from the
 * fast relativistic table (Wright 1979, ApJ 232, 348): equal to
 * `componentResponse({kind: "tsz", kTeKeV}, band, unit)` to rounding, at ~20 ns per call.
 */
export function createTszBandResponse(band: BandSpec, unit: MapUnit, opts: UnitOptions = {}): TszBandResponse {
  const fast = defaultFastRelativisticTsz();
  const den = unitBandResponse(unit, band, opts);
  const i0 = cmbIntensityScale();
  let nu: Float64Array;
  let w: Float64Array;
  if (isBandpassBand(band)) {
    const q = bandQuadrature(band.bandpass);
    nu = q.frequencyGHz;
    w = q.weight;
  } else {
    nu = Float64Array.of(bandReferenceFrequency(band));
    w = Float64Array.of(1);
  }
  const coeffs = new Float64Array(fast.nTheta);
  const tmp = new Float64Array(fast.nTheta);
  let c0 = 0;
  let inTable = true;
  for (let q = 0; q < nu.length; q++) {
    const x = dimensionlessFrequency(nu[q] as number);
    if (x > fast.xMax) inTable = false;
    if (!inTable) break;
    const a = ((w[q] as number) * i0 * blackbodyDerivativeShape(x)) / den;
    c0 += a * tszShape(x);
    fast.correctionCoefficients(x, tmp);
    for (let k = 0; k < coeffs.length; k++) coeffs[k] = (coeffs[k] as number) + a * (tmp[k] as number);
  }
  const slow = (kte: number): number => componentResponse({ kind: "tsz", kTeKeV: kte }, band, unit, opts);
  const response = (kTeKeV: number): number => {
    if (!inTable || !(kTeKeV >= 0 && kTeKeV <= fast.kTeMaxKeV)) return slow(checkElectronTemperature(kTeKeV));
    return c0 + thetaFromKeV(kTeKeV) * fast.evaluateCorrection(coeffs, kTeKeV);
  };
  return {
    response,
    responseMany(kTeKeV, out = new Float64Array(kTeKeV.length)) {
      for (let i = 0; i < kTeKeV.length; i++) out[i] = response(kTeKeV[i] as number);
      return out;
    },
  };
}
