/**
 * Linear growth factor of matter perturbations for a cosmological constant (or none) with
 * curvature: D(a) ∝ (5 Ω_m/2) E(a) ∫₀^a da′ / (a′ E(a′))³ (Heath 1977, MNRAS 179, 351, eq. 7;
 * also Carroll, Press & Turner 1992, ARA&A 30, 499, eq. 28). Not valid for dark energy with
 * w ≠ −1 or when radiation matters (z ≳ 10³).
 */
import type { HaloCosmology } from "./types.js";

function growthIntegral(cosmo: HaloCosmology, a: number): number {
  // substitute a' = a·u^2 (u in [0,1]) to remove the a'^{3/2} behaviour near 0; Simpson, 400 panels
  const n = 400;
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const u = i / n;
    let f = 0; // at u = 0 the integrand vanishes: (a′E)⁻³ ∝ a′^{3/2} in matter domination
    if (u > 0) {
      const ap = a * u * u;
      const e = cosmo.efunc(1 / ap - 1);
      f = (2 * a * u) / (ap * e) ** 3;
    }
    const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
    sum += w * f;
  }
  return sum / (3 * n);
}

/**
 * Linear growth factor D(z) normalised to D(0) = 1 (dimensionless), Heath 1977 eq. 7.
 */
export function growthFactor(cosmo: HaloCosmology, z: number): number {
  if (!(z >= 0) || !Number.isFinite(z)) throw new RangeError(`redshift must be finite and >= 0, got ${z}`);
  const g = (a: number): number => cosmo.efunc(1 / a - 1) * growthIntegral(cosmo, a);
  return g(1 / (1 + z)) / g(1);
}
