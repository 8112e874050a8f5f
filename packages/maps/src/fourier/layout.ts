/**
 * The spectrum layout of our float64 and float32 plans: the half plane kx = 0 … floor(nx/2) stored
 * column by column ("transposed"): mode m = ix·ny + iy holds F[ky(iy), kx = ix] with
 * ky(iy) = iy for iy ≤ floor((ny−1)/2), else iy − ny (numpy's fftfreq·ny order). Each column of
 * ny modes is contiguous, which is what the y pass of the 2-D transform wants.
 */
import type { SpectrumLayout } from "./types.js";

/** Number of stored kx columns: floor(nx/2) + 1. */
export function halfWidth(nx: number): number {
  return Math.floor(nx / 2) + 1;
}

/** Build the per-mode arrays (signed indices, Hermitian weights) of the column-major half-plane layout. */
export function makeTransposedLayout(nx: number, ny: number): SpectrumLayout {
  const nh = halfWidth(nx);
  const modeCount = nh * ny;
  const kxIndex = new Int32Array(modeCount);
  const kyIndex = new Int32Array(modeCount);
  const hermitianWeight = new Float64Array(modeCount);
  const lastPositive = Math.floor((ny - 1) / 2);
  for (let ix = 0; ix < nh; ix++) {
    const selfPaired = ix === 0 || (nx % 2 === 0 && ix === nx / 2);
    const w = selfPaired ? 1 : 2;
    for (let iy = 0; iy < ny; iy++) {
      const m = ix * ny + iy;
      kxIndex[m] = ix;
      kyIndex[m] = iy <= lastPositive ? iy : iy - ny;
      hermitianWeight[m] = w;
    }
  }
  return Object.freeze({ nx, ny, modeCount, spectrumLength: 2 * modeCount, kxIndex, kyIndex, hermitianWeight });
}
