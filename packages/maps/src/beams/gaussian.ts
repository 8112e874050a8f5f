/** The Gaussian beam from its FWHM (common practice). */
import { UmbraError, fwhmToSigma, RAD_PER_ARCMIN } from "@umbra/core";
import type { Beam } from "./types.js";

/**
 * A Gaussian beam of full width at half maximum `fwhmArcmin`: profile exp(−θ²/(2σ²)),
 * transfer B_ℓ = exp(−ℓ(ℓ+1)σ²/2), solid angle 2πσ² = π FWHM²/(4 ln 2), with σ = FWHM/sqrt(8 ln 2)
 * (common practice, no source; see `types.ts` for the multipole convention).
 * @throws UmbraError BAD_VALUE unless 0 < fwhmArcmin < ∞.
 */
export function gaussianBeam(fwhmArcmin: number): Beam {
  if (!(fwhmArcmin > 0) || !Number.isFinite(fwhmArcmin)) {
    throw new UmbraError("BAD_VALUE", `beam FWHM ${fwhmArcmin} arcmin must be a positive number`, { field: "fwhmArcmin", value: fwhmArcmin });
  }
  const sigma = fwhmToSigma(fwhmArcmin) * RAD_PER_ARCMIN;
  const half = 0.5 * sigma * sigma;
  return {
    kind: "gaussian",
    fwhmArcmin,
    solidAngleSr: 2 * Math.PI * sigma * sigma,
    ellMax: Infinity,
    transferAtEll: (ell) => Math.exp(-ell * (ell + 1) * half),
    transferOnEll(ells, out = new Float64Array(ells.length)) {
      for (let i = 0; i < ells.length; i++) {
        const l = ells[i] as number;
        out[i] = Math.exp(-l * (l + 1) * half);
      }
      return out;
    },
    profileAtThetaRad: (theta) => Math.exp(-(theta * theta) / (2 * sigma * sigma)),
  };
}

/** FWHM (arcmin) of the Gaussian with the same solid angle: sqrt(4 ln 2 · Ω / π). */
export function equivalentFwhmArcmin(beam: Beam): number {
  return Math.sqrt((4 * Math.LN2 * beam.solidAngleSr) / Math.PI) / RAD_PER_ARCMIN;
}
