/**
 * Physical Compton y and integrated Y of a cluster of mass M500 at redshift z for a pressure
 * profile: y(θ) = σ_T/(m_e c²) ∫ P dl and Y = ∫ y dΩ (e.g. Arnaud et al. 2010, A&A 517, A92,
 * eqs. 14–16). Y in Mpc² is D_A² times Y in steradians.
 */
import { ARCMIN2_PER_SR, RAD_PER_ARCMIN } from "@umbra/core";
import { ME_C2_KEV, MPC_CM, SIGMA_T_M2 } from "../constants.js";
import { m500ToR500Mpc, requireMass } from "../cosmology/overdensity.js";
import type { Cosmology } from "../cosmology/types.js";
import { p500KeVCm3 } from "./gnfw.js";
import { cylindricalIntegral, DEFAULT_TRUNCATION, lineOfSightIntegral, sphericalIntegral } from "./projection.js";
import type { PressureProfile } from "./types.js";

/** σ_T/(m_e c²) in cm² keV⁻¹ (CODATA 2018). */
export const SIGMA_T_OVER_ME_C2_CM2_PER_KEV = (SIGMA_T_M2 * 1e4) / ME_C2_KEV;

/** The size and pressure scale of one cluster. */
export interface ClusterScale {
  m500Msun: number;
  z: number;
  r500Mpc: number;
  /** D_A(z) in Mpc. */
  dAMpc: number;
  theta500Arcmin: number;
  p500KeVCm3: number;
  /** E(z). */
  eZ: number;
}

/** R500, θ500, D_A, E(z) and P500 (A10 eq. 5) of a cluster (z > 0). */
export function clusterScale(m500Msun: number, z: number, cosmo: Cosmology): ClusterScale {
  requireMass(m500Msun);
  const r500Mpc = m500ToR500Mpc(m500Msun, z, cosmo);
  const dAMpc = cosmo.angularDiameterDistanceMpc(z);
  return {
    m500Msun,
    z,
    r500Mpc,
    dAMpc,
    theta500Arcmin: r500Mpc / dAMpc / RAD_PER_ARCMIN,
    p500KeVCm3: p500KeVCm3(m500Msun, z, cosmo),
    eZ: cosmo.efunc(z),
  };
}

/** Central Compton y (unconvolved) of the profile truncated at T·R500: σ_T/(m_e c²) P500 R500 ℓ(0). */
export function centralY(profile: PressureProfile, scale: ClusterScale, truncation = DEFAULT_TRUNCATION): number {
  return SIGMA_T_OVER_ME_C2_CM2_PER_KEV * scale.p500KeVCm3 * scale.r500Mpc * MPC_CM * lineOfSightIntegral(profile, 0, truncation);
}

/** Compton y at projected radius θ = x·θ500 (unconvolved). */
export function yAtX(profile: PressureProfile, scale: ClusterScale, x: number, truncation = DEFAULT_TRUNCATION): number {
  return SIGMA_T_OVER_ME_C2_CM2_PER_KEV * scale.p500KeVCm3 * scale.r500Mpc * MPC_CM * lineOfSightIntegral(profile, x, truncation);
}

function volumeFactorMpc2(scale: ClusterScale): number {
  // σ_T/(m_e c²) [cm²/keV] · P500 [keV/cm³] · R500³ [Mpc³] · (cm per Mpc) → Mpc²
  return SIGMA_T_OVER_ME_C2_CM2_PER_KEV * scale.p500KeVCm3 * scale.r500Mpc ** 3 * MPC_CM;
}

/** Y_sph(X·R500) in Mpc²: σ_T/(m_e c²) ∫0^{X R500} 4π r² P dr (A10 eq. 14), profile truncated at T. */
export function ySphMpc2(profile: PressureProfile, scale: ClusterScale, xR500 = 1, truncation = DEFAULT_TRUNCATION): number {
  return volumeFactorMpc2(scale) * sphericalIntegral(profile, xR500, truncation);
}

/** Y_cyl(X·R500) in Mpc²: y integrated over the disc of radius X·θ500 through the sphere truncated at T (A10 eq. 15). */
export function yCylMpc2(profile: PressureProfile, scale: ClusterScale, xR500 = 1, truncation = DEFAULT_TRUNCATION): number {
  return volumeFactorMpc2(scale) * cylindricalIntegral(profile, xR500, truncation);
}

/** Y in arcmin² from Y in Mpc² for this cluster's D_A. */
export function mpc2ToArcmin2At(scale: ClusterScale, yMpc2: number): number {
  return (yMpc2 / (scale.dAMpc * scale.dAMpc)) * ARCMIN2_PER_SR;
}

/** Y5R500 in arcmin²: y over the disc of radius 5θ500 of the profile truncated at 5R500 (= Y_sph(5R500)). */
export function y5r500Arcmin2(profile: PressureProfile, scale: ClusterScale): number {
  return mpc2ToArcmin2At(scale, yCylMpc2(profile, scale, 5, 5));
}

/** Y5R500 in Mpc²: D_A² times {@link y5r500Arcmin2} (= Y_sph(5R500) of the profile truncated at 5R500). */
export function y5r500Mpc2(profile: PressureProfile, scale: ClusterScale): number {
  return yCylMpc2(profile, scale, 5, 5);
}

/** Y500 in arcmin²: Y_sph(R500) of the profile truncated at 5R500, divided by D_A². */
export function y500Arcmin2(profile: PressureProfile, scale: ClusterScale): number {
  return mpc2ToArcmin2At(scale, ySphMpc2(profile, scale, 1, 5));
}

/**
 * Y_cyl(T·θ500)/y0 in units of θ500² (dimensionless): the area of the normalised template,
 * 2π ∫0^T x ℓ(x)/ℓ(0) dx. Multiply by θ500² (arcmin²) to get Y5R500/y0 in arcmin² for T = 5.
 */
export function templateAreaOverY0(profile: PressureProfile, truncation = DEFAULT_TRUNCATION): number {
  return cylindricalIntegral(profile, truncation, truncation) / lineOfSightIntegral(profile, 0, truncation);
}

/** The ratio Y5R500/y0 in arcmin² for a cluster of size θ500 (arcmin): θ500² · {@link templateAreaOverY0}. */
export function y5r500OverY0Arcmin2(profile: PressureProfile, theta500Arcmin: number): number {
  return theta500Arcmin * theta500Arcmin * templateAreaOverY0(profile, DEFAULT_TRUNCATION);
}
