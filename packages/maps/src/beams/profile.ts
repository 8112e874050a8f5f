/**
 * A beam given as a tabulated radial profile B(θ): cubic spline through the table (zero slope at
 * θ = 0), solid angle Ω = 2π ∫ B θ dθ, and B_ℓ by the Hankel transform
 * B_ℓ = (2π/Ω) ∫_0^{θmax} B(θ) J0(sqrt(ℓ(ℓ+1)) θ) θ dθ (flat-sky; Bracewell 2000, The Fourier
 * Transform and its Applications, ch. 12, for the 2-D Fourier transform of a circularly symmetric
 * function), tabulated once on an ℓ grid and spline-interpolated.
 */
import { UmbraError } from "@umbra/core";
import { cubicSpline, findInterval, splineAt } from "./spline.js";
import { hankelIntegral, splineMoment } from "./hankel.js";
import type { Beam } from "./types.js";

/** Options of {@link profileBeam}. */
export interface ProfileBeamOptions {
  /** Name of the source (file) for error messages. */
  source?: string;
  /** |B_ℓ| below which the ℓ grid may stop (default 1e-10). */
  transferFloor?: number;
}

/**
 * Beam from a radial profile tabulated at angles `thetaRad` (strictly increasing, starting at 0)
 * with values `value` (any scale; normalised by value at θ = 0, which must be > 0). The profile is
 * 0 beyond the last angle. With σ_core = θ_half / sqrt(2 ln 2) (θ_half: where the profile first
 * falls to 1/2) and θ_ext the largest angle where |B| ≥ 1e-4, B_ℓ is computed on a grid with
 * steps Δℓ = clamp(0.02·ℓ, 0.1/θ_ext, 0.04/σ_core) (fine where the wings shape B_ℓ, coarse where
 * only the core does), up to
 * ellMax = min(π / min Δθ, 25/σ_core), or earlier once ℓ·σ_core ≥ 10 and |B_ℓ| < `transferFloor`
 * over the last 10 points; beyond ellMax, B_ℓ = 0 (for the core, exp(−25²/2) ≈ 1e-136).
 * @throws UmbraError BAD_DATA for a table that violates these rules.
 */
export function profileBeam(thetaRad: Float64Array, value: Float64Array, options: ProfileBeamOptions = {}): Beam {
  const where = options.source === undefined ? {} : { file: options.source };
  const n = thetaRad.length;
  if (n < 4 || value.length !== n) throw new UmbraError("BAD_DATA", `a beam profile needs at least 4 rows (got ${n})`, where);
  if (thetaRad[0] !== 0) throw new UmbraError("BAD_DATA", `a beam profile must start at θ = 0 (first angle ${thetaRad[0]})`, { ...where, row: 1 });
  const v0 = value[0] as number;
  if (!(v0 > 0)) throw new UmbraError("BAD_DATA", `beam profile value at θ = 0 must be > 0 (got ${v0})`, { ...where, row: 1 });
  let minStep = Infinity;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(value[i] as number)) throw new UmbraError("BAD_DATA", `beam profile value is not finite`, { ...where, row: i + 1 });
    if (i > 0) minStep = Math.min(minStep, (thetaRad[i] as number) - (thetaRad[i - 1] as number));
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = (value[i] as number) / v0;
  const s = cubicSpline(Float64Array.from(thetaRad), y, "flat");
  const thetaMax = thetaRad[n - 1] as number;
  const m1 = splineMoment(s, (t) => t);
  if (!(m1 > 0)) throw new UmbraError("BAD_DATA", "beam profile has no positive solid angle", where);
  const solidAngleSr = 2 * Math.PI * m1;
  const sigmaCore = coreSigma(thetaRad, y);

  const floor = options.transferFloor ?? 1e-10;
  const thetaExt = extentRadius(thetaRad, y, 1e-4);
  const stepMin = 0.1 / Math.max(thetaExt, sigmaCore);
  const stepMax = Math.max(stepMin, 0.04 / sigmaCore);
  const ellCap = Math.min(Math.PI / minStep, 25 / sigmaCore);
  const raw = (ell: number): number => {
    const k = Math.sqrt(ell * (ell + 1));
    return hankelIntegral(s, k, (t) => t, (t) => t, k);
  };
  const b0 = raw(0);
  // B is a smooth function of k² = ℓ(ℓ+1) (the transform of a radial profile is even in k), so the
  // spline runs over u = ℓ(ℓ+1), which keeps the behaviour 1 − u σ²/2 near ℓ = 0 exact.
  const us: number[] = [];
  const bs: number[] = [];
  let quiet = 0;
  let ellMax = 0;
  let next = 0;
  for (let j = 0; ; j++) {
    const ell = Math.min(next, ellCap);
    next = ell + Math.min(stepMax, Math.max(stepMin, 0.02 * ell));
    const b = j === 0 ? 1 : raw(ell) / b0;
    us.push(ell * (ell + 1));
    bs.push(b);
    ellMax = ell;
    quiet = Math.abs(b) < floor ? quiet + 1 : 0;
    if (ell >= ellCap || (ell * sigmaCore >= 10 && quiet >= 10)) break;
  }
  const transfer = cubicSpline(Float64Array.from(us), Float64Array.from(bs), "natural");

  const transferAtEll = (ell: number): number => (ell < 0 || ell > ellMax || Number.isNaN(ell) ? (ell < 0 ? NaN : 0) : splineAt(transfer, ell * (ell + 1)));
  return {
    kind: "profile",
    fwhmArcmin: null,
    solidAngleSr,
    ellMax,
    transferAtEll,
    transferOnEll(list, out = new Float64Array(list.length)) {
      for (let i = 0; i < list.length; i++) out[i] = transferAtEll(list[i] as number);
      return out;
    },
    profileAtThetaRad: (theta) => {
      const t = Math.abs(theta);
      return t > thetaMax ? 0 : splineAt(s, t, findInterval(s.x, t));
    },
  };
}

/** σ of the Gaussian with the same half-power radius as the (normalised) tabulated profile. */
function coreSigma(theta: Float64Array, y: Float64Array): number {
  for (let i = 1; i < y.length; i++) {
    if ((y[i] as number) <= 0.5) {
      const t0 = theta[i - 1] as number;
      const t1 = theta[i] as number;
      const f = ((y[i - 1] as number) - 0.5) / ((y[i - 1] as number) - (y[i] as number));
      return (t0 + f * (t1 - t0)) / Math.sqrt(2 * Math.LN2);
    }
  }
  return (theta[theta.length - 1] as number) / Math.sqrt(2 * Math.LN2);
}

/** Largest tabulated angle where |profile| ≥ `level` (peak-normalised). */
function extentRadius(theta: Float64Array, y: Float64Array, level: number): number {
  for (let i = y.length - 1; i > 0; i--) if (Math.abs(y[i] as number) >= level) return theta[i] as number;
  return theta[1] as number;
}
