/**
 * The variance of aperture photometry as a radial integral over multipoles, using the continuous
 * aperture's Fourier transform. Used by measureCatalogByIlc because the sum over the modes of a
 * small local grid misses the large scales (the map's own lowest multipoles) where a steep
 * residual spectrum (atmosphere, CMB) still reaches the aperture's annulus; a full-map FFT per
 * aperture size would be too slow on large maps.
 *
 * Kernel (weights 1 in the disc of radius R, −A_d/A_a in the annulus [R_in, R_out]):
 *   F(ℓ) = D(ℓ; R) − (A_d/A_a) [D(ℓ; R_out) − D(ℓ; R_in)],  D(ℓ; r) = 2π r² J1(ℓr)/(ℓr)
 * (the Fourier transform of a disc: Bracewell 2000, The Fourier Transform and its Applications,
 * the jinc pair; from memory), and for a statistically isotropic field of flat-sky power C(ℓ) (sr)
 *   Var(Y_ap) = ∫ d²ℓ/(2π)² F(ℓ)² C(ℓ) = (1/2π) ∫ ℓ F(ℓ)² C(ℓ) dℓ   (sr²; common practice).
 */
import { ARCMIN2_PER_SR, RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import { checkApertureSpec, type ApertureSpec } from "./photometry.js";

/**
 * J1(x), the Bessel function of the first kind of order one. |x| < 25: Bessel's integral
 * J1(x) = (1/2π) ∫_{−π}^{π} cos(τ − x sin τ) dτ (DLMF 10.9.2) by the trapezoidal rule with
 * 4⌈(2|x| + 64)/4⌉ nodes (periodic analytic integrand: the error is the aliased J_{N±1}(x), far
 * below 1e-15). |x| ≥ 25: the Hankel expansion (DLMF 10.17.3) with ω = x − 3π/4 and
 * a_{k+1} = a_k (4 − (2k+1)²)/(8(k+1)), summed until the terms stop decreasing (error ~e^{−2x}).
 */
export function besselJ1(x: number): number {
  const ax = Math.abs(x);
  let j: number;
  if (ax < 25) {
    const n = 4 * Math.ceil((2 * ax + 64) / 4);
    let s = 0;
    for (let k = 0; k < n; k++) {
      const t = -Math.PI + (2 * Math.PI * k) / n;
      s += Math.cos(t - ax * Math.sin(t));
    }
    j = s / n;
  } else {
    let p = 1;
    let q = 0;
    let term = 1;
    let prev = Infinity;
    for (let k = 0; k < 200; k++) {
      term *= (4 - (2 * k + 1) * (2 * k + 1)) / ((k + 1) * 8 * ax);
      const mag = Math.abs(term);
      if (mag >= prev || mag < 1e-17) break;
      prev = mag;
      const m = k + 1;
      if (m % 2 === 0) p += (m / 2) % 2 === 0 ? term : -term;
      else q += ((m - 1) / 2) % 2 === 0 ? term : -term;
    }
    const w = ax - (3 * Math.PI) / 4;
    j = Math.sqrt(2 / (Math.PI * ax)) * (p * Math.cos(w) - q * Math.sin(w));
  }
  return x < 0 ? -j : j;
}

/** Fourier transform of a unit disc of radius r (rad) at multipole ℓ, sr: 2π r² J1(ℓr)/(ℓr) (πr² at ℓ = 0). */
export function discTransform(ell: number, rRad: number): number {
  const x = ell * rRad;
  if (x < 1e-6) return Math.PI * rRad * rRad * (1 - (x * x) / 8);
  return (2 * Math.PI * rRad * rRad * besselJ1(x)) / x;
}

/**
 * Var(Y_ap) in arcmin⁴ of the continuous aperture `spec` on a field of power C(ℓ) (sr), integrated
 * over ℓ ∈ [0, ellMax] by the trapezoidal rule on a grid fine enough to resolve the kernel's
 * oscillations (step ≤ 2π/(24 R_out)) and C's bins (`ellStep`).
 */
export function apertureVarianceRadial(spec: ApertureSpec, power: (ell: number) => number, ellMax: number, ellStep: number): number {
  checkApertureSpec(spec);
  if (!(ellMax > 0) || !(ellStep > 0)) throw new UmbraError("BAD_VALUE", `ellMax ${ellMax} and ellStep ${ellStep} must be > 0`, { field: "ellMax" });
  const r = spec.radiusArcmin * RAD_PER_ARCMIN;
  const ri = spec.annulusInnerArcmin * RAD_PER_ARCMIN;
  const ro = spec.annulusOuterArcmin * RAD_PER_ARCMIN;
  const ratio = (r * r) / (ro * ro - ri * ri);
  const step = Math.min(ellStep, (2 * Math.PI) / (24 * ro));
  const n = Math.ceil(ellMax / step);
  const h = ellMax / n;
  let acc = 0;
  for (let i = 1; i <= n; i++) {
    const l = i * h;
    const f = discTransform(l, r) - ratio * (discTransform(l, ro) - discTransform(l, ri));
    const v = l * f * f * power(l);
    acc += i === n ? 0.5 * v : v;
  }
  return ((acc * h) / (2 * Math.PI)) * ARCMIN2_PER_SR * ARCMIN2_PER_SR;
}
