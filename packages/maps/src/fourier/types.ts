/**
 * The real 2-D FFT interface every package uses. There is exactly one place that states the
 * normalisation: here.
 *
 * - forward:  F[ky, kx] = Σ_{y,x} f[y, x] · exp(−2πi (kx·x/nx + ky·y/ny))   (unnormalised; numpy rfft2)
 * - inverse:  f[y, x]  = (1/(nx·ny)) Σ_{ky,kx} F[ky, kx] · exp(+2πi (…))      (numpy irfft2)
 *
 * Only the half plane kx = 0 … floor(nx/2) is stored; the rest follows from Hermitian symmetry
 * F[−k] = conj(F[k]). The order of the stored modes is the plan's business (it may be transposed);
 * consumers never index the spectrum by (kx, ky) arithmetic: they use the per-mode arrays of the
 * {@link SpectrumLayout} (signed indices, Hermitian weight) and the helpers in this folder. A
 * spectrum buffer holds `modeCount` complex numbers interleaved (re, im).
 */

/** Where each stored mode sits in the Fourier plane. All arrays have length `modeCount`. */
export interface SpectrumLayout {
  readonly nx: number;
  readonly ny: number;
  /** Number of stored complex modes: ny · (floor(nx/2) + 1). */
  readonly modeCount: number;
  /** Length of a spectrum buffer in numbers: 2 · modeCount (interleaved re, im). */
  readonly spectrumLength: number;
  /** Signed frequency index along x of each stored mode, in cycles per map (0 … floor(nx/2)). */
  readonly kxIndex: Int32Array;
  /** Signed frequency index along y of each stored mode, in cycles per map (−ny/2 … ny/2−1 style, as numpy's fftfreq·ny). */
  readonly kyIndex: Int32Array;
  /**
   * How many times the mode counts in a sum over the full Fourier plane: 1 where the mode's
   * conjugate partner is also stored or it is its own partner (kx = 0, and kx = nx/2 for even nx),
   * 2 elsewhere. Σ_modes w·|F|² = Σ_full-plane |F|² (Parseval).
   */
  readonly hermitianWeight: Float64Array;
}

/** A reusable plan for one map shape. Plans hold scratch buffers: one plan per thread. */
export interface Rfft2Plan {
  readonly nx: number;
  readonly ny: number;
  readonly layout: SpectrumLayout;
  /** Forward transform (normalisation above). `map` (length nx·ny) is not modified; `spectrum` has length layout.spectrumLength. */
  forward(map: Float64Array, spectrum: Float64Array): void;
  /** Inverse transform (normalisation above). `spectrum` is not modified; `map` receives nx·ny values. */
  inverse(spectrum: Float64Array, map: Float64Array): void;
}

/** A float32 plan for one (nx, ny): same contract as {@link Rfft2Plan} with Float32Array buffers. Call `dispose()` to free its wasm memory. */
export interface Rfft2PlanF32 {
  readonly nx: number;
  readonly ny: number;
  readonly layout: SpectrumLayout;
  /** Forward transform (normalisation of types.ts); `map` (nx·ny) is not modified. */
  forward(map: Float32Array, spectrum: Float32Array): void;
  /** Inverse transform (normalisation of types.ts); `spectrum` is not modified. */
  inverse(spectrum: Float32Array, map: Float32Array): void;
  /** Free the plan's wasm buffers; the plan must not be used afterwards. */
  dispose(): void;
}
