/**
 * The generalised NFW pressure profile (Nagai, Kravtsov & Vikhlinin 2007, ApJ 668, 1, eq. 8),
 *   p(x) = P0 / [(c500 x)^γ (1 + (c500 x)^α)^((β−γ)/α)],  x = r/R500,
 * and the universal profile of Arnaud et al. 2010 (A&A 517, A92; "A10") with its parameters
 * (their eq. 12), its characteristic pressure P500 (eq. 5) and its mass dependence (eqs. 9–11).
 */
import { UmbraError, requireFinite } from "@umbra/core";
import { requireMass } from "../cosmology/overdensity.js";
import { requireRedshift } from "../cosmology/create.js";
import type { Cosmology } from "../cosmology/types.js";
import type { PressureProfile } from "./types.js";

/** Shape parameters of a GNFW profile (P0 is the dimensionless normalisation in units of P500). */
export interface GnfwParams {
  P0: number;
  c500: number;
  gamma: number;
  alpha: number;
  beta: number;
}

/**
 * The A10 universal-profile parameters for h70 = 1 (Arnaud et al. 2010, A&A 517, A92, eq. 12):
 * P0 = 8.403 h70^−3/2, c500 = 1.177, γ = 0.3081, α = 1.0510, β = 5.4905.
 */
export const A10_UNIVERSAL: Readonly<GnfwParams> = Object.freeze({ P0: 8.403, c500: 1.177, gamma: 0.3081, alpha: 1.051, beta: 5.4905 });

/** Names of the published GNFW parameter sets in {@link GNFW_PARAMETER_SETS}. */
export type GnfwSetName = "a10" | "a10-cool-core" | "a10-disturbed";

/**
 * Published GNFW parameter sets (h70 = 1), all from Arnaud et al. 2010 (A&A 517, A92):
 * `a10` the universal profile (eq. 12); `a10-cool-core` and `a10-disturbed` the fits to the
 * cool-core and morphologically disturbed REXCESS sub-samples (their Appendix C; from memory of the
 * paper: cool core P0 = 3.249, c500 = 1.128, γ = 0.7736, α = 1.2223; disturbed P0 = 3.202,
 * c500 = 1.083, γ = 0.3798, α = 1.4063; β = 5.4905 for both).
 */
export const GNFW_PARAMETER_SETS: Readonly<Record<GnfwSetName, Readonly<GnfwParams>>> = Object.freeze({
  a10: A10_UNIVERSAL,
  "a10-cool-core": Object.freeze({ P0: 3.249, c500: 1.128, gamma: 0.7736, alpha: 1.2223, beta: 5.4905 }),
  "a10-disturbed": Object.freeze({ P0: 3.202, c500: 1.083, gamma: 0.3798, alpha: 1.4063, beta: 5.4905 }),
});

/** The parameter set `name`; throws BAD_VALUE naming an unknown set. */
export function gnfwParameterSet(name: string): Readonly<GnfwParams> {
  if (!Object.prototype.hasOwnProperty.call(GNFW_PARAMETER_SETS, name)) {
    throw new UmbraError("BAD_VALUE", `unknown profile parameter set '${name}' (known: ${Object.keys(GNFW_PARAMETER_SETS).join(", ")})`, {
      field: "profile",
      value: name,
    });
  }
  return GNFW_PARAMETER_SETS[name as GnfwSetName];
}

/** The A10 mass-dependence slope α_P = 0.12 (Arnaud et al. 2010, eq. 7; from memory of the paper). */
export const A10_ALPHA_P = 0.12;
/** The A10 pivot mass 3×10^14 h70^−1 M☉ (Arnaud et al. 2010, eqs. 5 and 22). */
export const A10_PIVOT_MSUN = 3e14;

function validate(p: GnfwParams): void {
  requireFinite("P0", p.P0, (v) => v > 0, "not positive");
  requireFinite("c500", p.c500, (v) => v > 0, "not positive");
  requireFinite("gamma", p.gamma, (v) => v >= 0 && v < 1, "outside [0, 1) (the central y would diverge)");
  requireFinite("alpha", p.alpha, (v) => v > 0, "not positive");
  requireFinite("beta", p.beta, (v) => v > 3, "not above 3 (the total pressure would diverge)");
}

/** The bare GNFW shape p(x) of Nagai et al. 2007 (eq. 8), x = r/R500. */
export function gnfwShape(p: GnfwParams, x: number): number {
  const cx = p.c500 * x;
  return p.P0 / (cx ** p.gamma * (1 + cx ** p.alpha) ** ((p.beta - p.gamma) / p.alpha));
}

/** A GNFW {@link PressureProfile} with the given parameters and no mass dependence. */
export function gnfwProfile(params: GnfwParams, label = "GNFW"): PressureProfile {
  validate(params);
  const p = { ...params };
  return {
    label,
    cuspSlope: p.gamma,
    key: `gnfw:${p.P0}:${p.c500}:${p.gamma}:${p.alpha}:${p.beta}`,
    pressureRatio: (x) => gnfwShape(p, x),
  };
}

/** Options of {@link gnfwA10}. */
export interface A10Options {
  /** M500 in M☉ (needed for the mass dependence; without it the profile is the bare eq. 12 shape). */
  m500Msun?: number;
  /** H0/70 (default 1): P0 scales as h70^−3/2 and the pivot mass as h70^−1. */
  h70?: number;
  /** Include the radius-dependent α'_P(x) term (A10 eqs. 10–11); default false. */
  alphaPPrime?: boolean;
  /** Override the shape parameters (default {@link A10_UNIVERSAL}); e.g. a set from {@link GNFW_PARAMETER_SETS}. */
  params?: GnfwParams;
  /** Label for reports (default names the A10 universal profile). */
  label?: string;
}

/**
 * α'_P(x) = 0.10 − (α_P + 0.10) (x/0.5)³ / (1 + (x/0.5)³) (Arnaud et al. 2010, eq. 10; from memory
 * of the paper): the radius dependence of the mass scaling, vanishing towards R500.
 */
export function a10AlphaPPrime(x: number): number {
  const t = (x / 0.5) ** 3;
  return 0.1 - ((A10_ALPHA_P + 0.1) * t) / (1 + t);
}

/**
 * The A10 universal pressure profile as P(r)/P500 (Arnaud et al. 2010, eq. 11 with eq. 12):
 *   P/P500 = p(x) · [M500 / (3×10^14 h70^−1 M☉)]^{α_P + α'_P(x)},
 * with p(x) the GNFW shape with P0 = 8.403 h70^−3/2, α_P = 0.12 and α'_P included only when
 * `alphaPPrime` is set. Without `m500Msun` the mass factor is 1.
 */
export function gnfwA10(opts: A10Options = {}): PressureProfile {
  const h70 = requireFinite("h70", opts.h70 ?? 1, (v) => v > 0, "not positive");
  const base = { ...(opts.params ?? A10_UNIVERSAL) };
  base.P0 = base.P0 * h70 ** -1.5;
  validate(base);
  const name = opts.label ?? (opts.params === undefined ? "A10 universal" : "A10-scaled GNFW");
  if (opts.m500Msun === undefined) return gnfwProfile(base, `${name} (no mass term)`);
  const m = requireMass(opts.m500Msun);
  const lnRatio = Math.log((m * h70) / A10_PIVOT_MSUN);
  const constFactor = Math.exp(A10_ALPHA_P * lnRatio);
  const prime = opts.alphaPPrime === true;
  return {
    label: prime ? `${name} (alpha_P + alpha'_P)` : `${name} (alpha_P)`,
    cuspSlope: base.gamma,
    key: `a10:${base.P0}:${base.c500}:${base.gamma}:${base.alpha}:${base.beta}:${prime ? `m${m}:h${h70}` : "flat"}:${constFactor}`,
    pressureRatio: prime
      ? (x) => gnfwShape(base, x) * Math.exp((A10_ALPHA_P + a10AlphaPPrime(x)) * lnRatio)
      : (x) => gnfwShape(base, x) * constFactor,
  };
}

/**
 * The characteristic pressure P500 in keV cm⁻³ (Arnaud et al. 2010, eq. 5):
 *   P500 = 1.65×10⁻³ E(z)^{8/3} [M500 / (3×10^14 h70^−1 M☉)]^{2/3} h70² keV cm⁻³.
 */
export function p500KeVCm3(m500Msun: number, z: number, cosmo: Cosmology): number {
  requireMass(m500Msun);
  requireRedshift(z);
  const e = cosmo.efunc(z);
  return 1.65e-3 * e ** (8 / 3) * ((m500Msun * cosmo.h70) / A10_PIVOT_MSUN) ** (2 / 3) * cosmo.h70 ** 2;
}
