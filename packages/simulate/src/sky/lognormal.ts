/**
 * Log-normal fields with a chosen two-point function on the periodic pixel grid (Coles & Jones
 * 1991, MNRAS 248, 1): δ = μ (exp(g − σ_g²/2) − 1) with g Gaussian has covariance
 * ξ_δ = μ² (exp(ξ_g) − 1), so the Gaussian field needs ξ_g = ln(1 + ξ_δ/μ²). On the grid,
 * ξ_δ is the inverse transform of the per-mode power C(ℓ)/ΔΩ (the FFT normalisation of
 * @umbra/maps), ξ_g is transformed back to per-mode Gaussian power (negative modes, where the
 * target is not reachable by a log-normal field, are set to 0), and μ = σ_δ / relativeRms.
 */
import type { Rfft2Plan } from "@umbra/maps";

/** Per-mode amplitudes sqrt(P_g) of the Gaussian field g, its variance σ_g², and the mean μ of the log-normal field. */
export interface LognormalPlan {
  gaussianAmplitude: Float64Array;
  varianceG: number;
  mean: number;
}

/**
 * From the target per-mode power of δ (`amplitude`² = C(ℓ)/ΔΩ, as {@link modeAmplitudes} gives)
 * and the fractional rms σ_δ/μ, the Gaussian field's per-mode amplitudes (Coles & Jones 1991).
 */
export function lognormalPlan(plan: Rfft2Plan, amplitude: Float64Array, relativeRms: number, scratchMap: Float64Array): LognormalPlan {
  const { layout } = plan;
  const spec = new Float64Array(layout.spectrumLength);
  for (let m = 0; m < layout.modeCount; m++) spec[2 * m] = amplitude[m]! * amplitude[m]!;
  plan.inverse(spec, scratchMap); // ξ_δ on the grid
  const variance = scratchMap[0]!;
  const mean = Math.sqrt(variance) / relativeRms;
  const mu2 = mean * mean;
  for (let p = 0; p < scratchMap.length; p++) scratchMap[p] = Math.log1p(scratchMap[p]! / mu2);
  const varianceG = scratchMap[0]!;
  plan.forward(scratchMap, spec); // per-mode Gaussian power (real up to rounding)
  const gaussianAmplitude = new Float64Array(layout.modeCount);
  for (let m = 0; m < layout.modeCount; m++) gaussianAmplitude[m] = Math.sqrt(Math.max(0, spec[2 * m]!));
  gaussianAmplitude[0] = 0; // zero-mean g; the mean of δ is fixed by the −σ_g²/2 shift below
  return { gaussianAmplitude, varianceG, mean };
}

/** In place: turn a Gaussian map g into δ = μ (exp(g − σ_g²/2) − 1). */
export function exponentiate(map: Float64Array, p: LognormalPlan): void {
  const shift = -0.5 * p.varianceG;
  for (let i = 0; i < map.length; i++) map[i] = p.mean * (Math.exp(map[i]! + shift) - 1);
}
