/**
 * The linear matter power spectrum P(k, z) = A kⁿˢ T²(k) D²(z) with the EH98 no-wiggle transfer
 * function, normalised so that σ(R = 8 h⁻¹ Mpc, z = 0) = σ8, and the rms fluctuation σ(M) in
 * top-hat spheres (Peebles 1980, The Large-Scale Structure of the Universe, §4.2 for the window;
 * the convention of Tinker et al. 2008, ApJ 688, 709, eq. 3).
 */
import { UmbraError } from "@umbra/core";
import { eh98NoWiggleTransfer } from "./transfer.js";
import { growthFactor } from "./growth.js";
import type { HaloCosmology } from "./types.js";

/** A tabulated z = 0 linear power spectrum on a logarithmic k grid (k in Mpc⁻¹, P in Mpc³). */
export interface LinearPower {
  readonly cosmo: HaloCosmology;
  /** ln k on a uniform grid (k in Mpc⁻¹). */
  readonly lnK: Float64Array;
  /** P(k) at z = 0 in Mpc³, normalised to σ8. */
  readonly pk: Float64Array;
  /** Step of the ln k grid. */
  readonly dlnK: number;
}

const LN_K_MIN = Math.log(1e-5);
const LN_K_MAX = Math.log(5e2);
const N_K = 2401; // odd: Simpson's rule

/** Top-hat window in Fourier space, W(x) = 3 (sin x − x cos x)/x³ (series below x = 1e-3). */
export function topHatWindow(x: number): number {
  if (x < 1e-3) return 1 - (x * x) / 10;
  return (3 * (Math.sin(x) - x * Math.cos(x))) / (x * x * x);
}

function simpsonWeight(i: number, n: number): number {
  return i === 0 || i === n - 1 ? 1 : i % 2 === 1 ? 4 : 2;
}

/** σ²(R) = ∫ dlnk k³P(k)/(2π²) W²(kR) for a tabulated spectrum, R in Mpc. */
function sigma2Raw(lnK: Float64Array, pk: Float64Array, dlnK: number, rMpc: number): number {
  let s = 0;
  for (let i = 0; i < lnK.length; i++) {
    const k = Math.exp(lnK[i]!);
    const w = topHatWindow(k * rMpc);
    s += simpsonWeight(i, lnK.length) * k * k * k * pk[i]! * w * w;
  }
  return (s * dlnK) / 3 / (2 * Math.PI * Math.PI);
}

/**
 * Build the σ8-normalised z = 0 linear power spectrum of `cosmo` (needs `sigma8` and `ns`).
 * P(k) = A kⁿˢ T²(k), T from EH98 eqs. 28–31, A fixed by σ(8 h⁻¹ Mpc) = σ8.
 */
export function linearPower(cosmo: HaloCosmology): LinearPower {
  const sigma8 = cosmo.sigma8;
  const ns = cosmo.ns;
  if (sigma8 === undefined || !(sigma8 > 0)) throw new UmbraError("BAD_VALUE", "the cosmology needs sigma8 > 0 for a mass function", { field: "sigma8", value: sigma8 });
  if (ns === undefined || !Number.isFinite(ns)) throw new UmbraError("BAD_VALUE", "the cosmology needs ns for a mass function", { field: "ns", value: ns });
  const dlnK = (LN_K_MAX - LN_K_MIN) / (N_K - 1);
  const lnK = new Float64Array(N_K);
  const k = new Float64Array(N_K);
  for (let i = 0; i < N_K; i++) {
    lnK[i] = LN_K_MIN + i * dlnK;
    k[i] = Math.exp(lnK[i]!);
  }
  const t = eh98NoWiggleTransfer(cosmo, k);
  const pk = new Float64Array(N_K);
  for (let i = 0; i < N_K; i++) pk[i] = k[i]! ** ns * t[i]! * t[i]!;
  const s2 = sigma2Raw(lnK, pk, dlnK, 8 / cosmo.h);
  const a = (sigma8 * sigma8) / s2;
  for (let i = 0; i < N_K; i++) pk[i]! *= a;
  return { cosmo, lnK, pk, dlnK };
}

/** σ(R) at z = 0 for a top-hat sphere of radius `rMpc` (Mpc), from a tabulated spectrum. */
export function sigmaR(power: LinearPower, rMpc: number): number {
  return Math.sqrt(sigma2Raw(power.lnK, power.pk, power.dlnK, rMpc));
}

/** Mean matter density today in M☉/Mpc³: ρ̄_m = Ω_m0 ρ_crit(0). */
export function meanMatterDensity0(cosmo: HaloCosmology): number {
  return cosmo.omegaM0 * cosmo.criticalDensityMsunPerMpc3(0);
}

/** Lagrangian radius (Mpc) of mass `mMsun` (M☉): R = (3M / (4π ρ̄_m0))^{1/3}. */
export function lagrangianRadiusMpc(cosmo: HaloCosmology, mMsun: number): number {
  return Math.cbrt((3 * mMsun) / (4 * Math.PI * meanMatterDensity0(cosmo)));
}

/**
 * σ(M, z) and d ln σ / d ln M for halo mass `mMsun` (M☉) at redshift z: σ(M, z) = D(z) σ(R(M), 0).
 * The derivative is the exact integral with dW²/dR, not a finite difference.
 */
export function sigmaM(power: LinearPower, mMsun: number, z: number): { sigma: number; dlnSigmaDlnM: number } {
  const r = lagrangianRadiusMpc(power.cosmo, mMsun);
  const { lnK, pk, dlnK } = power;
  let s = 0;
  let ds = 0;
  for (let i = 0; i < lnK.length; i++) {
    const k = Math.exp(lnK[i]!);
    const x = k * r;
    const w = topHatWindow(x);
    // dW/dx = 3 (sin x (1 − 3/x²)·... ) written stably: dW/dx = (3 sin x − 3 x cos x)·(−3/x⁴) + 3 sin x / x²
    const dw = x < 1e-3 ? -x / 5 : (3 * Math.sin(x)) / (x * x) - (3 * w) / x;
    const base = simpsonWeight(i, lnK.length) * k * k * k * pk[i]!;
    s += base * w * w;
    ds += base * 2 * w * dw * x; // d(W²)/d ln R
  }
  const sigma2 = (s * dlnK) / 3 / (2 * Math.PI * Math.PI);
  const dSigma2DlnR = (ds * dlnK) / 3 / (2 * Math.PI * Math.PI);
  const d = growthFactor(power.cosmo, z);
  // ln σ = ½ ln σ² ; d ln R / d ln M = 1/3
  return { sigma: d * Math.sqrt(sigma2), dlnSigmaDlnM: (0.5 * dSigma2DlnR) / sigma2 / 3 };
}
