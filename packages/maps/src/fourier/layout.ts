/**
 * Spectrum layouts of our plans. Both store the half plane kx = 0 … floor(nx/2) with
 * ky(iy) = iy for iy ≤ floor((ny−1)/2), else iy − ny (numpy's fftfreq·ny order):
 * - row-major (float64 plan; numpy's rfft2 order): mode m = iy·nh + ix, nh = floor(nx/2) + 1;
 * - transposed (float32 plan): mode m = ix·ny + iy, each column of ny modes contiguous.
 * Consumers never rely on either: they use the layout's per-mode arrays.
 */
import type { SpectrumLayout } from "./types.js";

/** Number of stored kx columns: floor(nx/2) + 1. */
export function halfWidth(nx: number): number {
  return Math.floor(nx / 2) + 1;
}

/** Per-mode arrays of the row-major half-plane layout (mode m = iy·nh + ix). */
export function makeRowMajorLayout(nx: number, ny: number): SpectrumLayout {
  return new HalfPlaneLayout(nx, ny, false);
}

/** Per-mode arrays of the transposed half-plane layout (mode m = ix·ny + iy). */
export function makeTransposedLayout(nx: number, ny: number): SpectrumLayout {
  return new HalfPlaneLayout(nx, ny, true);
}

/**
 * A half-plane layout whose per-mode arrays (16 bytes per mode: as much as a spectrum buffer) are
 * built on first use, so a plan used only to transform holds none of them. The arrays, once built,
 * are the same objects on every access.
 */
class HalfPlaneLayout implements SpectrumLayout {
  readonly nx: number;
  readonly ny: number;
  readonly modeCount: number;
  readonly spectrumLength: number;
  private readonly transposed: boolean;
  private arrays: { kxIndex: Int32Array; kyIndex: Int32Array; hermitianWeight: Float64Array } | null = null;

  constructor(nx: number, ny: number, transposed: boolean) {
    this.nx = nx;
    this.ny = ny;
    this.modeCount = halfWidth(nx) * ny;
    this.spectrumLength = 2 * this.modeCount;
    this.transposed = transposed;
  }

  get kxIndex(): Int32Array {
    return this.built().kxIndex;
  }

  get kyIndex(): Int32Array {
    return this.built().kyIndex;
  }

  get hermitianWeight(): Float64Array {
    return this.built().hermitianWeight;
  }

  private built(): { kxIndex: Int32Array; kyIndex: Int32Array; hermitianWeight: Float64Array } {
    if (this.arrays === null) this.arrays = buildModeArrays(this.nx, this.ny, this.transposed);
    return this.arrays;
  }
}

/** Build the per-mode arrays (signed indices, Hermitian weights) of a half-plane layout. */
function buildModeArrays(nx: number, ny: number, transposed: boolean): { kxIndex: Int32Array; kyIndex: Int32Array; hermitianWeight: Float64Array } {
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
      const m = transposed ? ix * ny + iy : iy * nh + ix;
      kxIndex[m] = ix;
      kyIndex[m] = iy <= lastPositive ? iy : iy - ny;
      hermitianWeight[m] = w;
    }
  }
  return { kxIndex, kyIndex, hermitianWeight };
}
