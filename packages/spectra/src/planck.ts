/**
 * The Planck spectrum in surface-brightness units (MJy/sr) and its temperature derivative, the
 * CMB intensity scale I0, and the Rayleigh–Jeans brightness per kelvin.
 *
 * B_ν(T) = (2hν³/c²) / (exp(hν/k_BT) − 1) (Planck 1901; Rybicki & Lightman 1979, Radiative
 * Processes in Astrophysics, eq. 1.51). dB/dT = B_ν · x eˣ / (T (eˣ − 1)) with x = hν/k_BT.
 */
import {
  BOLTZMANN_K_JPK,
  HZ_PER_GHZ,
  MJY_PER_SR_SI,
  PLANCK_H_JS,
  SPEED_OF_LIGHT_MPS,
  T0_K,
} from "./constants.js";

const H_OVER_K = PLANCK_H_JS / BOLTZMANN_K_JPK; // [K s]
const TWO_H_OVER_C2_MJY = (2 * PLANCK_H_JS) / (SPEED_OF_LIGHT_MPS * SPEED_OF_LIGHT_MPS) / MJY_PER_SR_SI;
const TWO_K_OVER_C2_MJY = (2 * BOLTZMANN_K_JPK) / (SPEED_OF_LIGHT_MPS * SPEED_OF_LIGHT_MPS) / MJY_PER_SR_SI;

/**
 * Dimensionless frequency x = hν / (k_B T) for ν in GHz; T defaults to the CMB T0 = 2.7255 K
 * (Fixsen 2009, ApJ 707, 916). 100 GHz ↦ x ≈ 1.7608.
 */
export function dimensionlessFrequency(frequencyGHz: number, temperatureK: number = T0_K): number {
  return (H_OVER_K * frequencyGHz * HZ_PER_GHZ) / temperatureK;
}

/** Frequency in GHz for a dimensionless frequency x = hν/(k_B T) (inverse of {@link dimensionlessFrequency}). */
export function frequencyFromDimensionless(x: number, temperatureK: number = T0_K): number {
  return (x * temperatureK) / (H_OVER_K * HZ_PER_GHZ);
}

/**
 * Planck intensity B_ν(T) in MJy/sr for ν in GHz and T in K:
 * B_ν = (2hν³/c²)/(exp(hν/k_BT) − 1) (Rybicki & Lightman 1979, eq. 1.51). Returns 0 for T = 0.
 */
export function planckIntensity(frequencyGHz: number, temperatureK: number): number {
  if (temperatureK <= 0) return 0;
  const nu = frequencyGHz * HZ_PER_GHZ;
  const x = (H_OVER_K * nu) / temperatureK;
  return (TWO_H_OVER_C2_MJY * nu * nu * nu) / Math.expm1(x);
}

/**
 * Temperature derivative of the Planck intensity, dB_ν/dT in MJy/sr per K, at ν in GHz and T in K
 * (default T0): dB/dT = (2hν³/c²) · x eˣ / (T (eˣ − 1)²), x = hν/k_BT (derivative of
 * Rybicki & Lightman 1979, eq. 1.51).
 */
export function dPlanckdT(frequencyGHz: number, temperatureK: number = T0_K): number {
  const nu = frequencyGHz * HZ_PER_GHZ;
  const x = (H_OVER_K * nu) / temperatureK;
  // written with e^(−x) so the Wien tail neither overflows nor gives Inf/Inf
  const d = -Math.expm1(-x);
  return (TWO_H_OVER_C2_MJY * nu * nu * nu * x * Math.exp(-x)) / (temperatureK * d * d);
}

/**
 * Rayleigh–Jeans brightness per kelvin, 2k_Bν²/c², in MJy/sr per K (Rybicki & Lightman 1979,
 * eq. 1.53): the reference spectrum of the K_RJ unit.
 */
export function rayleighJeansPerK(frequencyGHz: number): number {
  const nu = frequencyGHz * HZ_PER_GHZ;
  return TWO_K_OVER_C2_MJY * nu * nu;
}

/**
 * The CMB intensity scale I0 = 2(k_B T0)³/(hc)² in MJy/sr (≈ 270.33 MJy/sr for T0 = 2.7255 K), so
 * that B_ν(T0) = I0 · x³/(eˣ − 1) (Rybicki & Lightman 1979, eq. 1.51 rewritten in x).
 */
export function cmbIntensityScale(temperatureK: number = T0_K): number {
  const kt = BOLTZMANN_K_JPK * temperatureK;
  const hc = PLANCK_H_JS * SPEED_OF_LIGHT_MPS;
  return (2 * kt * kt * kt) / (hc * hc) / MJY_PER_SR_SI;
}

/**
 * The spectral shape G(x) = x⁴ eˣ / (eˣ − 1)², so that T0·dB/dT(T0) = I0·G(x) (same source as
 * {@link dPlanckdT}). Stable for large x (computed as x⁴ e⁻ˣ / (1 − e⁻ˣ)²).
 */
export function blackbodyDerivativeShape(x: number): number {
  const emx = Math.exp(-x);
  const d = -Math.expm1(-x);
  return (x * x * x * x * emx) / (d * d);
}
