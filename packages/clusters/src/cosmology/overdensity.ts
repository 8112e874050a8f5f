/**
 * Spherical-overdensity sizes: a halo of mass M_Δ has mean density Δ·ρ_c(z) inside R_Δ, so
 * M_Δ = (4π/3) Δ ρ_c(z) R_Δ³ (e.g. Arnaud et al. 2010, A&A 517, A92, Sect. 2: M500 with Δ = 500).
 */
import { ARCMIN2_PER_SR, arcminToRad, requireFinite, radToArcmin } from "@umbra/core";
import { requireRedshift } from "./create.js";
import type { Cosmology } from "./types.js";

/** Throw BAD_VALUE unless the mass is finite and > 0 (M☉). */
export function requireMass(mMsun: number, field = "m500Msun"): number {
  return requireFinite(field, mMsun, (v) => v > 0, "not a positive mass");
}

/** R_Δ in Mpc of a halo of mass `mMsun` (M☉) at redshift z: (3M/(4πΔρ_c(z)))^{1/3}; Δ = 500 by default. */
export function m500ToR500Mpc(m500Msun: number, z: number, cosmo: Cosmology, delta = 500): number {
  requireMass(m500Msun);
  requireRedshift(z);
  return Math.cbrt((3 * m500Msun) / (4 * Math.PI * delta * cosmo.criticalDensityMsunPerMpc3(z)));
}

/** M_Δ in M☉ of a halo of radius `rMpc` at redshift z (inverse of {@link m500ToR500Mpc}). */
export function r500ToM500Msun(r500Mpc: number, z: number, cosmo: Cosmology, delta = 500): number {
  requireFinite("r500Mpc", r500Mpc, (v) => v > 0, "not positive");
  requireRedshift(z);
  return ((4 * Math.PI) / 3) * delta * cosmo.criticalDensityMsunPerMpc3(z) * r500Mpc ** 3;
}

/** θ500 in radians: R500 / D_A(z) (small-angle). z must be > 0. */
export function theta500Rad(m500Msun: number, z: number, cosmo: Cosmology): number {
  requireFinite("z", z, (v) => v > 0, "not above 0 (an angular size needs a distance)");
  return m500ToR500Mpc(m500Msun, z, cosmo) / cosmo.angularDiameterDistanceMpc(z);
}

/** θ500 in arcmin: R500 / D_A(z) (small-angle). z must be > 0. */
export function theta500Arcmin(m500Msun: number, z: number, cosmo: Cosmology): number {
  return radToArcmin(theta500Rad(m500Msun, z, cosmo));
}

/** M500 in M☉ of a cluster whose R500 subtends θ500 (arcmin) at redshift z > 0: R500 = θ500·D_A, then M = (4π/3)·500·ρ_c(z)·R500³. */
export function theta500ToM500Msun(theta500Arcmin: number, z: number, cosmo: Cosmology): number {
  requireFinite("theta500Arcmin", theta500Arcmin, (v) => v > 0, "not positive");
  requireFinite("z", z, (v) => v > 0, "not above 0 (an angular size needs a distance)");
  return r500ToM500Msun(arcminToRad(theta500Arcmin) * cosmo.angularDiameterDistanceMpc(z), z, cosmo);
}

/** Converts an integrated Y in Mpc² to arcmin² at redshift z: Y[arcmin²] = Y[Mpc²] / D_A² · (arcmin²/sr). */
export function mpc2ToArcmin2(yMpc2: number, z: number, cosmo: Cosmology): number {
  const da = cosmo.angularDiameterDistanceMpc(requireFinite("z", z, (v) => v > 0, "not above 0"));
  return (yMpc2 / (da * da)) * ARCMIN2_PER_SR;
}

/** Converts an integrated Y in arcmin² to Mpc² at redshift z (inverse of {@link mpc2ToArcmin2}). */
export function arcmin2ToMpc2(yArcmin2: number, z: number, cosmo: Cosmology): number {
  const da = cosmo.angularDiameterDistanceMpc(requireFinite("z", z, (v) => v > 0, "not above 0"));
  return (yArcmin2 / ARCMIN2_PER_SR) * da * da;
}
