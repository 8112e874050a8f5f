/**
 * The Eisenstein & Hu 1998 (ApJ 496, 605; "EH98") matter transfer function, the zero-baryon-
 * oscillation ("no-wiggle") form of their §4.2, plus the physical scales it is built from. We use
 * the no-wiggle form: it carries the baryon suppression of power but not the acoustic wiggles,
 * which change σ(M) on cluster scales by well under 1 % (EH98 §4.2 state the form is accurate to
 * a few per cent against the full transfer function away from the oscillations).
 */
import type { HaloCosmology } from "./types.js";

/** CMB temperature in K used when the cosmology gives none (Fixsen 2009, ApJ 707, 916). */
export const DEFAULT_TCMB_K = 2.7255;

/** The scales of EH98 for a cosmology: ω_m = Ω_m h², ω_b = Ω_b h², θ = T_CMB / 2.7 K. */
export interface Eh98Scales {
  /** Redshift of matter–radiation equality (EH98 eq. 2). */
  zEq: number;
  /** Scale of the particle horizon at equality in Mpc⁻¹ (EH98 eq. 3). */
  kEqPerMpc: number;
  /** Drag-epoch redshift (EH98 eq. 4). */
  zDrag: number;
  /** Sound horizon at the drag epoch in Mpc, the exact integral's closed form (EH98 eq. 6). */
  soundHorizonMpc: number;
  /** Sound horizon in Mpc from the fitting formula (EH98 eq. 26). */
  soundHorizonFitMpc: number;
  /** Silk damping scale in Mpc⁻¹ (EH98 eq. 7). */
  kSilkPerMpc: number;
}

function tcmbOf(c: HaloCosmology): number {
  return c.tcmbK ?? DEFAULT_TCMB_K;
}

/**
 * The EH98 physical scales (equality, drag epoch, sound horizon, Silk scale) for `cosmo`.
 * Formulas: EH98 eqs. 2–7 and 26.
 */
export function eh98Scales(cosmo: HaloCosmology): Eh98Scales {
  const om = cosmo.omegaM0 * cosmo.h * cosmo.h;
  const ob = cosmo.omegaB0 * cosmo.h * cosmo.h;
  const th = tcmbOf(cosmo) / 2.7;
  const zEq = 2.5e4 * om * th ** -4; // eq. 2
  const kEq = 7.46e-2 * om * th ** -2; // eq. 3, Mpc^-1
  const b1 = 0.313 * om ** -0.419 * (1 + 0.607 * om ** 0.674); // eq. 4
  const b2 = 0.238 * om ** 0.223;
  const zDrag = ((1291 * om ** 0.251) / (1 + 0.659 * om ** 0.828)) * (1 + b1 * ob ** b2);
  const R = (z: number): number => 31.5 * ob * th ** -4 * (1000 / z); // eq. 5
  const rEq = R(zEq);
  const rD = R(zDrag);
  const s = (2 / (3 * kEq)) * Math.sqrt(6 / rEq) * Math.log((Math.sqrt(1 + rD) + Math.sqrt(rD + rEq)) / (1 + Math.sqrt(rEq))); // eq. 6
  const sFit = (44.5 * Math.log(9.83 / om)) / Math.sqrt(1 + 10 * ob ** 0.75); // eq. 26
  const kSilk = 1.6 * ob ** 0.52 * om ** 0.73 * (1 + (10.4 * om) ** -0.95); // eq. 7
  return { zEq, kEqPerMpc: kEq, zDrag, soundHorizonMpc: s, soundHorizonFitMpc: sFit, kSilkPerMpc: kSilk };
}

/**
 * The EH98 no-wiggle transfer function T(k) at wavenumbers `kPerMpc` (Mpc⁻¹, not h/Mpc), written
 * into a new array. EH98 eqs. 28–31 with the sound horizon of eq. 26:
 * Γ_eff = Ω_m h [α_Γ + (1 − α_Γ)/(1 + (0.43 k s)⁴)], q = k Θ²/(Γ_eff h),
 * T = L0/(L0 + C0 q²), L0 = ln(2e + 1.8 q), C0 = 14.2 + 731/(1 + 62.5 q).
 */
export function eh98NoWiggleTransfer(cosmo: HaloCosmology, kPerMpc: ArrayLike<number>): Float64Array {
  const h = cosmo.h;
  const om = cosmo.omegaM0 * h * h;
  const fb = cosmo.omegaB0 / cosmo.omegaM0;
  const th = tcmbOf(cosmo) / 2.7;
  const s = eh98Scales(cosmo).soundHorizonFitMpc;
  const alphaG = 1 - 0.328 * Math.log(431 * om) * fb + 0.38 * Math.log(22.3 * om) * fb * fb; // eq. 31
  const out = new Float64Array(kPerMpc.length);
  for (let i = 0; i < out.length; i++) {
    const k = kPerMpc[i]!;
    const ks = 0.43 * k * s;
    const gammaEff = cosmo.omegaM0 * h * (alphaG + (1 - alphaG) / (1 + ks * ks * ks * ks)); // eq. 30
    const q = (k * th * th) / (gammaEff * h); // eq. 28 (k/h in h/Mpc)
    const l0 = Math.log(2 * Math.E + 1.8 * q); // eq. 29
    const c0 = 14.2 + 731 / (1 + 62.5 * q);
    out[i] = l0 / (l0 + c0 * q * q);
  }
  return out;
}
