/**
 * A compact approximation of the best-fit lensed ΛCDM CMB temperature spectrum of the 2018
 * CMB-satellite release (Planck Collaboration 2020, A&A 641, A6): ln D_ℓ as a natural cubic spline
 * in √ℓ with 64 knots, least-squares fitted by fixtures/simulate/fit_cmb_spectrum.py. Largest
 * deviation from the published spectrum: {@link LCDM_TT_MAX_DEVIATION} (0.37 %) for 30 ≤ ℓ ≤ 2508,
 * 0.64 % for 2 ≤ ℓ ≤ 2508. Above ℓ = 2508 (the end of the published table) ln D_ℓ continues
 * linearly in ℓ with the damping-tail slope fitted over 2300 ≤ ℓ ≤ 2508 (an extrapolation).
 */
import { evalSpline, naturalSpline, type NaturalSpline } from "@umbra/clusters";
import {
  LCDM_TT_ELL_MAX_FIT,
  LCDM_TT_KNOT_LN_DELL,
  LCDM_TT_KNOT_SQRT_ELL,
  LCDM_TT_MAX_DEVIATION,
  LCDM_TT_TAIL_SLOPE,
} from "./lcdmCoefficients.js";

export { LCDM_TT_MAX_DEVIATION };

let spline: NaturalSpline | null = null;

/**
 * D_ℓ = ℓ(ℓ+1)C_ℓ/2π of lensed ΛCDM TT in µK_CMB² (Planck Collaboration 2020, A&A 641, A6,
 * best fit; our 64-knot approximation, see module comment). Returns 0 for ℓ < 2.
 */
export function lcdmTtDellUK2(ell: number): number {
  if (!(ell >= 2)) return 0;
  if (spline === null) spline = naturalSpline(LCDM_TT_KNOT_SQRT_ELL, LCDM_TT_KNOT_LN_DELL);
  if (ell <= LCDM_TT_ELL_MAX_FIT) return Math.exp(evalSpline(spline, Math.sqrt(ell)));
  const top = evalSpline(spline, Math.sqrt(LCDM_TT_ELL_MAX_FIT));
  return Math.exp(top + LCDM_TT_TAIL_SLOPE * (ell - LCDM_TT_ELL_MAX_FIT));
}

/** C_ℓ of lensed ΛCDM TT in K_CMB²·sr: C_ℓ = 2π D_ℓ / (ℓ(ℓ+1)) × 1e-12 (D_ℓ from {@link lcdmTtDellUK2}). */
export function lcdmTtClK2(ell: number): number {
  if (!(ell >= 2)) return 0;
  return (2 * Math.PI * lcdmTtDellUK2(ell) * 1e-12) / (ell * (ell + 1));
}
