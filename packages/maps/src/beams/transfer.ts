/**
 * A beam given as a tabulated transfer function B_ℓ: cubic spline in ℓ, B_ℓ = 0 beyond the
 * table; profile by the inverse Hankel transform with k = sqrt(ℓ(ℓ+1)), k dk = (ℓ + ½) dℓ:
 * B(θ) = ∫ B_ℓ J0(kθ) (ℓ + ½) dℓ / ∫ B_ℓ (ℓ + ½) dℓ, and solid angle Ω = 2π / ∫ B_ℓ (ℓ + ½) dℓ
 * (flat-sky inverse of the transform in `profile.ts`; for a Gaussian B_ℓ = exp(−ℓ(ℓ+1)σ²/2) the
 * integral is exactly 1/σ², so Ω = 2πσ²).
 */
import { UmbraError } from "@umbra/core";
import { cubicSpline, findInterval, splineAt } from "./spline.js";
import { hankelIntegral, splineMoment } from "./hankel.js";
import type { Beam } from "./types.js";

/**
 * Beam from B_ℓ tabulated at multipoles `ell` (strictly increasing, starting at 0) with values
 * `bell` (normalised by the value at ℓ = 0, which must be > 0).
 * @throws UmbraError BAD_DATA for a table that violates these rules.
 */
export function transferBeam(ell: Float64Array, bell: Float64Array, source?: string): Beam {
  const where = source === undefined ? {} : { file: source };
  const n = ell.length;
  if (n < 4 || bell.length !== n) throw new UmbraError("BAD_DATA", `a B_ell table needs at least 4 rows (got ${n})`, where);
  if (ell[0] !== 0) throw new UmbraError("BAD_DATA", `a B_ell table must start at ell = 0 (first ell ${ell[0]})`, { ...where, row: 1 });
  const b0 = bell[0] as number;
  if (!(b0 > 0)) throw new UmbraError("BAD_DATA", `B_ell at ell = 0 must be > 0 (got ${b0})`, { ...where, row: 1 });
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(bell[i] as number)) throw new UmbraError("BAD_DATA", "B_ell value is not finite", { ...where, row: i + 1 });
    y[i] = (bell[i] as number) / b0;
  }
  const s = cubicSpline(Float64Array.from(ell), y, "natural");
  const ellMax = ell[n - 1] as number;
  const norm = splineMoment(s, (l) => l + 0.5);
  if (!(norm > 0)) throw new UmbraError("BAD_DATA", "B_ell table gives no positive solid angle", where);
  const kOf = (l: number): number => Math.sqrt(l * (l + 1));
  const half = (l: number): number => l + 0.5;
  const transferAtEll = (l: number): number => (l < 0 || Number.isNaN(l) ? NaN : l > ellMax ? 0 : splineAt(s, l, findInterval(s.x, l)));
  return {
    kind: "transfer",
    fwhmArcmin: null,
    solidAngleSr: (2 * Math.PI) / norm,
    ellMax,
    transferAtEll,
    transferOnEll(list, out = new Float64Array(list.length)) {
      for (let i = 0; i < list.length; i++) out[i] = transferAtEll(list[i] as number);
      return out;
    },
    profileAtThetaRad: (theta) => {
      const t = Math.abs(theta);
      return t === 0 ? 1 : hankelIntegral(s, t, kOf, half, t) / norm;
    },
  };
}
