/**
 * The beam: an azimuthally symmetric instrument response, as a radial profile B(θ) (peak 1) and
 * its transfer function B_ℓ (B_0 = 1).
 *
 * Multipole convention, shared by every kind: the flat-sky Hankel transform
 * B_ℓ = (2π/Ω) ∫ B(θ) J0(k θ) θ dθ is evaluated at wavenumber k = sqrt(ℓ(ℓ+1)). With it the
 * transform of a Gaussian profile is exactly the common-practice Gaussian window
 * exp(−ℓ(ℓ+1)σ²/2) (DLMF 10.22.51 for the integral), so tabulated and analytic beams agree; for a
 * flat-sky wavenumber ℓ = 2π|k| the difference from k = ℓ is a factor exp(−ℓσ²/2) ≈ 1 − 4e-4 at
 * ℓ = 10^4 for a 1.4 arcmin FWHM.
 */

/** Which representation a beam was built from. */
export type BeamKind = "gaussian" | "profile" | "transfer";

/** An azimuthally symmetric beam. */
export interface Beam {
  readonly kind: BeamKind;
  /** FWHM in arcmin for a Gaussian beam; null for tabulated beams (see `equivalentFwhmArcmin`). */
  readonly fwhmArcmin: number | null;
  /** Solid angle Ω = 2π ∫ B(θ) θ dθ in steradians (flat sky, B peak-normalised). */
  readonly solidAngleSr: number;
  /** Largest multipole with a computed transfer; beyond it B_ℓ is taken as 0 (Infinity for Gaussian). */
  readonly ellMax: number;
  /** B_ℓ at multipole ℓ ≥ 0, normalised B_0 = 1. */
  transferAtEll(ell: number): number;
  /** B_ℓ for every entry of `ells`, written into `out` (allocated when absent). */
  transferOnEll(ells: Float64Array, out?: Float64Array): Float64Array;
  /** Radial profile at angle θ (radians) from the axis, normalised to 1 at θ = 0. */
  profileAtThetaRad(thetaRad: number): number;
}
