/**
 * Y–M scaling relations: the predicted spherical Y500 = Y_sph(R500) in Mpc² (D_A² times Y in
 * steradians) of a cluster of mass M500 (M☉, the relation's own mass definition) at redshift z,
 * with an intrinsic log-normal scatter σ_lnY.
 */
import { requireFinite } from "@umbra/core";
import { requireMass } from "../cosmology/overdensity.js";
import { requireRedshift } from "../cosmology/create.js";
import type { Cosmology } from "../cosmology/types.js";

/** A Y500–M500 relation. */
export interface YmRelation {
  readonly label: string;
  /** Mean Y_sph(R500) in Mpc² for true mass M500 (M☉) at z. */
  y500Mpc2(m500Msun: number, z: number, cosmo: Cosmology): number;
  /** Intrinsic scatter of ln Y at fixed mass. */
  readonly sigmaLnY: number;
}

/** Options of {@link a10YmRelation}. */
export interface A10YmOptions {
  /** I(1) of the profile (default 0.6145, A10 eq. 25 as published). */
  i1?: number;
  /** Mass slope (default 5/3 + α_P = 1.7867, the profile-derived slope of A10 eq. 25). */
  alpha?: number;
  /** Intrinsic scatter σ_lnY (default 0: the profile-derived relation carries none). */
  sigmaLnY?: number;
}

/**
 * The Y_sph(R500)–M500 relation implied by the A10 universal profile (Arnaud et al. 2010,
 * A&A 517, A92, eq. 25; from memory of the paper):
 *   E(z)^{−2/3} Y_sph(R500) = 2.925×10⁻⁵ I(1) h70^{−1} [M500 / (3×10^14 h70^−1 M☉)]^{α} Mpc²,
 * with I(1) = 0.6145 and α = 5/3 + α_P. The h70 dependence written here (h70^{−5/2} overall for
 * M500 in M☉) follows from the profile's P0 ∝ h70^{−3/2} and P500 ∝ h70²; it reduces to the paper
 * for h70 = 1.
 */
export function a10YmRelation(opts: A10YmOptions = {}): YmRelation {
  const i1 = requireFinite("i1", opts.i1 ?? 0.6145, (v) => v > 0, "not positive");
  const alpha = requireFinite("alpha", opts.alpha ?? 5 / 3 + 0.12, (v) => v > 0, "not positive");
  const sigmaLnY = requireFinite("sigmaLnY", opts.sigmaLnY ?? 0, (v) => v >= 0, "negative");
  return {
    label: "A10 universal profile Y500-M500",
    sigmaLnY,
    y500Mpc2(m500Msun, z, cosmo) {
      requireMass(m500Msun);
      requireRedshift(z);
      const h70 = cosmo.h70;
      return 2.925e-5 * i1 * cosmo.efunc(z) ** (2 / 3) * ((m500Msun * h70) / 3e14) ** alpha * h70 ** -2.5;
    },
  };
}

/** Options of {@link planck2014YmRelation}; defaults are the paper's baseline. */
export interface Planck2014YmOptions {
  /** Hydrostatic mass bias factor (1 − b) (default 0.8, the baseline of Planck 2014 XX Sect. 3.2). */
  oneMinusB?: number;
  /** log10 Y* (default −0.186). */
  logYStar?: number;
  /** Mass slope α (default 1.789). */
  alpha?: number;
  /** Redshift slope β (default 0.66). */
  beta?: number;
  /** Intrinsic scatter in log10 Y (default 0.075). */
  sigmaLogY?: number;
}

/**
 * The Y500–M500 relation used for the Planck 2013 SZ cluster counts (Planck Collaboration 2014,
 * A&A 571, A20, eq. 7, with their Table 1 values, from memory of the paper):
 *   E(z)^{−β} [D_A² Y500 / 10⁻⁴ Mpc²] = Y* (h/0.7)^{−2+α} [(1−b) M500 / 6×10^14 M☉]^α,
 * log Y* = −0.186, α = 1.789, β = 0.66, σ_log Y = 0.075 (so σ_lnY = 0.075 ln 10), (1 − b) = 0.8.
 */
export function planck2014YmRelation(opts: Planck2014YmOptions = {}): YmRelation {
  const oneMinusB = requireFinite("oneMinusB", opts.oneMinusB ?? 0.8, (v) => v > 0 && v <= 2, "outside (0, 2]");
  const logYStar = requireFinite("logYStar", opts.logYStar ?? -0.186);
  const alpha = requireFinite("alpha", opts.alpha ?? 1.789, (v) => v > 0, "not positive");
  const beta = requireFinite("beta", opts.beta ?? 0.66);
  const sigmaLogY = requireFinite("sigmaLogY", opts.sigmaLogY ?? 0.075, (v) => v >= 0, "negative");
  const yStar = 10 ** logYStar;
  return {
    label: `Planck 2014 Y500-M500 ((1-b) = ${oneMinusB})`,
    sigmaLnY: sigmaLogY * Math.LN10,
    y500Mpc2(m500Msun, z, cosmo) {
      requireMass(m500Msun);
      requireRedshift(z);
      return 1e-4 * yStar * cosmo.h70 ** (-2 + alpha) * ((oneMinusB * m500Msun) / 6e14) ** alpha * cosmo.efunc(z) ** beta;
    },
  };
}
