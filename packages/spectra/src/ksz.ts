/**
 * Kinematic Sunyaev–Zel'dovich effect (Sunyaev & Zel'dovich 1980, MNRAS 190, 413):
 * ΔT/T0 = −τ v_r/c with v_r > 0 for a receding cluster, so ΔI = −I0 (τ v_r/c) x⁴eˣ/(eˣ − 1)²
 * (Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked). The spectrum is that of a CMB temperature change.
 * Relativistic corrections to the kSZ are not included (not checked against a published formula).
 */
import { T0_K } from "./constants.js";
import { dPlanckdT } from "./planck.js";

/** kSZ thermodynamic temperature change per unit τ·v_r/c: ΔT/T0 = −1 (Sunyaev & Zel'dovich 1980, MNRAS 190, 413). */
export const KSZ_TEMPERATURE_SHAPE = -1;

/**
 * kSZ intensity change per unit τ·v_r/c in MJy/sr at ν (GHz): ΔI = −T0 dB/dT(ν, T0)
 * (Birkinshaw 1999, Phys. Rep. 310, 97; equation numbers not checked; v_r > 0 receding).
 */
export function kszIntensity(frequencyGHz: number): number {
  return -T0_K * dPlanckdT(frequencyGHz);
}
