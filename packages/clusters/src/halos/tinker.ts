/**
 * The Tinker et al. 2008 (ApJ 688, 709) halo mass function for spherical-overdensity masses:
 * f(σ) = A [(σ/b)^(−a) + 1] exp(−c/σ²) (their eq. 3), parameters from their Table 2 interpolated
 * with a cubic spline in log10 Δ using the second derivatives printed in that table (Δ relative to the MEAN matter density), evolving with
 * redshift as their eqs. 5–8, and dn/dM = f(σ) (ρ̄_m/M) d ln σ⁻¹/dM (their eq. 2).
 */
import { UmbraError } from "@umbra/core";
import { evalSpline, splineWithSecondDerivatives, type NaturalSpline } from "./spline.js";
import { meanMatterDensity0, sigmaM, type LinearPower } from "./power.js";
import type { HaloCosmology } from "./types.js";

/** Tinker et al. 2008, Table 2: overdensities Δ (w.r.t. mean density) and the z = 0 parameters. */
export const TINKER08_TABLE2 = {
  delta: [200, 300, 400, 600, 800, 1200, 1600, 2400, 3200],
  A: [0.186, 0.2, 0.212, 0.218, 0.248, 0.255, 0.26, 0.26, 0.26],
  a: [1.47, 1.52, 1.56, 1.61, 1.87, 2.13, 2.3, 2.53, 2.66],
  b: [2.57, 2.25, 2.05, 1.87, 1.59, 1.51, 1.46, 1.44, 1.41],
  c: [1.19, 1.27, 1.34, 1.45, 1.58, 1.8, 1.97, 2.24, 2.44],
  /** Second derivatives with respect to x = log10 Δ, as printed in Table 2 for spline interpolation. */
  d2A: [0, 0.5, -1.56, 3.05, -2.95, 1.07, -0.71, 0.21, 0],
  d2a: [0, 1.19, -6.34, 21.36, -10.95, 2.59, -0.85, -2.07, 0],
  d2b: [0, -1.08, 12.61, -20.96, 24.08, -6.64, 3.84, -2.09, 0],
  d2c: [0, 0.94, -0.43, 4.61, 0.01, 1.21, 1.43, 0.33, 0],
} as const;

/** The four parameters of the Tinker 2008 multiplicity function. */
export interface Tinker08Params {
  A: number;
  a: number;
  b: number;
  c: number;
}

let splines: { A: NaturalSpline; a: NaturalSpline; b: NaturalSpline; c: NaturalSpline } | null = null;

/**
 * The splines in log10 Δ through Table 2 with the table's own second derivatives (built once).
 * (A natural spline through the rounded table values differs from the printed second derivatives
 * by up to 0.1–1; we follow the printed ones, which reproduce the paper's interpolation.)
 */
export function tinker08Splines(): { A: NaturalSpline; a: NaturalSpline; b: NaturalSpline; c: NaturalSpline } {
  if (splines === null) {
    const T = TINKER08_TABLE2;
    const x = T.delta.map((d) => Math.log10(d));
    splines = {
      A: splineWithSecondDerivatives(x, T.A, T.d2A),
      a: splineWithSecondDerivatives(x, T.a, T.d2a),
      b: splineWithSecondDerivatives(x, T.b, T.d2b),
      c: splineWithSecondDerivatives(x, T.c, T.d2c),
    };
  }
  return splines;
}

/**
 * Tinker 2008 parameters for overdensity `deltaMean` (w.r.t. the mean matter density, 200–3200)
 * at redshift z: Table 2 spline-interpolated in log10 Δ, then A(z) = A₀(1+z)^−0.14 (eq. 5),
 * a(z) = a₀(1+z)^−0.06 (eq. 6), b(z) = b₀(1+z)^−α (eq. 7), log10 α = −[0.75/log10(Δ/75)]^1.2 (eq. 8).
 */
export function tinker08Params(deltaMean: number, z: number): Tinker08Params {
  if (!(deltaMean >= 200 && deltaMean <= 3200)) {
    throw new UmbraError("BAD_VALUE", `Tinker 2008 is calibrated for 200 <= Delta_mean <= 3200, got ${deltaMean}`, { field: "deltaMean", value: deltaMean });
  }
  const s = tinker08Splines();
  const x = Math.log10(deltaMean);
  const zp1 = 1 + z;
  const alpha = 10 ** -((0.75 / Math.log10(deltaMean / 75)) ** 1.2);
  return {
    A: evalSpline(s.A, x) * zp1 ** -0.14,
    a: evalSpline(s.a, x) * zp1 ** -0.06,
    b: evalSpline(s.b, x) * zp1 ** -alpha,
    c: evalSpline(s.c, x),
  };
}

/** The multiplicity function f(σ) = A [(σ/b)^(−a) + 1] exp(−c/σ²) (Tinker et al. 2008, eq. 3). */
export function tinker08F(sigma: number, p: Tinker08Params): number {
  return p.A * ((sigma / p.b) ** -p.a + 1) * Math.exp(-p.c / (sigma * sigma));
}

/** Ω_m(z) = Ω_m0 (1+z)³ / E²(z). */
export function omegaMatterAt(cosmo: HaloCosmology, z: number): number {
  const e = cosmo.efunc(z);
  return (cosmo.omegaM0 * (1 + z) ** 3) / (e * e);
}

/**
 * Overdensity w.r.t. the mean matter density equivalent to `deltaCrit` w.r.t. the critical density
 * at z: Δ_m = Δ_c / Ω_m(z) (definition; Tinker et al. 2008 §2).
 */
export function deltaCritToMean(cosmo: HaloCosmology, deltaCrit: number, z: number): number {
  return deltaCrit / omegaMatterAt(cosmo, z);
}

/** Options of {@link tinker08DnDlnM}: the overdensity w.r.t. critical density (default 500). */
export interface MassFunctionOptions {
  deltaCrit?: number;
}

/**
 * The halo mass function dn/d ln M in Mpc⁻³ (comoving) for masses `mMsun` (M☉, defined at
 * Δ_crit, default 500c) at redshift z: dn/dlnM = f(σ) ρ̄_m0 / M · |d ln σ / d ln M|
 * (Tinker et al. 2008, eq. 2, with dM/M = dlnM). Note that the Tinker fit assumes the masses are
 * spherical-overdensity masses; converting 500c → Δ_m = 500/Ω_m(z) keeps the same halos.
 */
export function tinker08DnDlnM(power: LinearPower, mMsun: number, z: number, opts: MassFunctionOptions = {}): number {
  const cosmo = power.cosmo;
  const dm = deltaCritToMean(cosmo, opts.deltaCrit ?? 500, z);
  const p = tinker08Params(dm, z);
  const { sigma, dlnSigmaDlnM } = sigmaM(power, mMsun, z);
  return (tinker08F(sigma, p) * meanMatterDensity0(cosmo) * Math.abs(dlnSigmaDlnM)) / mMsun;
}
