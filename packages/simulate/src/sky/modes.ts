/**
 * Gaussian fields built directly in Fourier space, in the normalisation of @umbra/maps
 * (fourier/types.ts: unnormalised forward transform). A map of unit white noise transforms to
 * modes W with ⟨|W_k|²⟩ = nx·ny; multiplying each mode by sqrt(C(ℓ)/ΔΩ) gives a field whose
 * flat-sky power is C(ℓ) (the recipe of the maps package's gaussianRealisation; common practice,
 * no single source). Working on modes lets correlated fields share one white-noise draw.
 */
import type { Rng } from "@umbra/core";
import type { Rfft2Plan } from "@umbra/maps";

/** Fourier modes of a unit-variance white-noise map drawn from `rng` (uses `scratch` as the map buffer). */
export function whiteModes(plan: Rfft2Plan, rng: Rng, scratch: Float64Array, out?: Float64Array): Float64Array {
  rng.fillNormal(scratch);
  const spec = out ?? new Float64Array(plan.layout.spectrumLength);
  plan.forward(scratch, spec);
  return spec;
}

/**
 * out += a · sqrt(C(ℓ_m)/ΔΩ) · W_m for every mode (C from `amplitude`, the per-mode sqrt(C/ΔΩ)).
 * `amplitude` has one real number per mode; `white` and `out` are interleaved spectra.
 */
export function addScaledModes(out: Float64Array, white: Float64Array, amplitude: Float64Array, a: number): void {
  for (let m = 0; m < amplitude.length; m++) {
    const s = a * amplitude[m]!;
    out[2 * m] = out[2 * m]! + s * white[2 * m]!;
    out[2 * m + 1] = out[2 * m + 1]! + s * white[2 * m + 1]!;
  }
}

/** Per-mode sqrt(C(ℓ)/ΔΩ) for a power spectrum `cl` (K²·sr) at the modes' multipoles; the ℓ = 0 mode gets 0. */
export function modeAmplitudes(ells: Float64Array, cl: (ell: number) => number, pixelSr: number): Float64Array {
  const out = new Float64Array(ells.length);
  for (let m = 0; m < ells.length; m++) {
    const l = ells[m]!;
    out[m] = l > 0 ? Math.sqrt(Math.max(0, cl(l)) / pixelSr) : 0;
  }
  return out;
}
