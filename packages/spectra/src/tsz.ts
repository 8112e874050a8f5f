/**
 * Thermal Sunyaev–Zel'dovich effect, non-relativistic (Kompaneets) limit.
 *
 * ΔT/T0 = y (x coth(x/2) − 4) and ΔI = I0 y x⁴eˣ/(eˣ − 1)² (x coth(x/2) − 4), x = hν/k_BT0
 * (Sunyaev & Zel'dovich 1972, Comments Astrophys. Space Phys. 4, 173; Birkinshaw 1999, Phys. Rep.
 * 310, 97; equation numbers not checked).
 */
import { blackbodyDerivativeShape, cmbIntensityScale, dimensionlessFrequency } from "./planck.js";

/**
 * The non-relativistic tSZ shape f(x) = x coth(x/2) − 4 (ΔT/T0 per unit y; Birkinshaw 1999, Phys.
 * Rep. 310, 97). f → −2 as x → 0; zero at x ≈ 3.830.
 */
export function tszShape(x: number): number {
  if (x < 1e-4) return -2 + (x * x) / 6; // series of x coth(x/2) = 2 + x²/6 − x⁴/360 + …
  return x / Math.tanh(0.5 * x) - 4;
}

/**
 * Non-relativistic tSZ thermodynamic temperature change per unit y, ΔT/T0 = x coth(x/2) − 4
 * (Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked), at ν in GHz (dimensionless; times T0 gives K_CMB).
 */
export function tszTemperatureShape(frequencyGHz: number): number {
  return tszShape(dimensionlessFrequency(frequencyGHz));
}

/**
 * Non-relativistic tSZ intensity change per unit y, ΔI/y = I0 x⁴eˣ/(eˣ−1)² (x coth(x/2) − 4) in
 * MJy/sr (Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked), at ν in GHz.
 */
export function tszIntensity(frequencyGHz: number): number {
  const x = dimensionlessFrequency(frequencyGHz);
  return cmbIntensityScale() * blackbodyDerivativeShape(x) * tszShape(x);
}
