/**
 * The float64 real 2-D FFT driver (normalisation: see types.ts; layout: see layout.ts).
 *
 * Forward: rows are transformed two at a time as one complex FFT z = a + i·b of length nx and
 * separated with A_k = (Z_k + conj Z_{−k})/2, B_k = (Z_k − conj Z_{−k})/(2i) (Press et al. 2007,
 * Numerical Recipes 3rd ed., sec. 12.3.2); the half rows are scattered straight into the
 * column-major spectrum, whose contiguous columns are then transformed in place along y.
 * Inverse: columns are transformed from the spectrum into the plan's one scratch buffer, then two
 * rows at a time are rebuilt as Z_k = A_k + i·B_k over the full k range (Hermitian extension; the
 * imaginary parts of the kx = 0 and kx = nx/2 columns are dropped, as numpy's irfft does) and
 * inverse-transformed. The 1/(nx·ny) factor is applied in that last unpacking loop.
 *
 * Memory: the caller's map and spectrum, one scratch of spectrumLength doubles (allocated on the
 * first inverse) and O(nx + ny) row/column buffers. No allocation per call.
 */
import { UmbraError } from "@umbra/core";
import { makeComplexFft } from "./bluestein.js";
import type { ComplexFft } from "./mixed-radix.js";
import { halfWidth, makeTransposedLayout } from "./layout.js";
import type { Rfft2Plan, SpectrumLayout } from "./types.js";

/** Throw BAD_VALUE unless n is an integer ≥ 1. */
export function checkDimension(name: string, n: number): void {
  if (!Number.isInteger(n) || n < 1) {
    throw new UmbraError("BAD_VALUE", `FFT size ${name} = ${String(n)} must be an integer ≥ 1`, { field: name, value: n });
  }
}

/** Throw BAD_VALUE unless `buf` has exactly `len` elements. */
export function checkLength(name: string, buf: ArrayLike<number>, len: number): void {
  if (buf.length !== len) {
    throw new UmbraError("BAD_VALUE", `${name} has length ${buf.length}, expected ${len}`, { field: name, value: buf.length });
  }
}

/** Float64 plan for one (nx, ny); see the module comment. Holds buffers: one plan per thread. */
export class Rfft2PlanF64 implements Rfft2Plan {
  readonly nx: number;
  readonly ny: number;
  readonly layout: SpectrumLayout;
  private readonly nh: number;
  private readonly rowFft: ComplexFft;
  private readonly colFft: ComplexFft;
  private readonly rowIn: Float64Array;
  private readonly rowOut: Float64Array;
  private scratch: Float64Array | null = null;

  constructor(nx: number, ny: number) {
    checkDimension("nx", nx);
    checkDimension("ny", ny);
    this.nx = nx;
    this.ny = ny;
    this.nh = halfWidth(nx);
    this.layout = makeTransposedLayout(nx, ny);
    this.rowFft = makeComplexFft(nx);
    this.colFft = ny === nx ? this.rowFft : makeComplexFft(ny);
    this.rowIn = new Float64Array(2 * nx);
    this.rowOut = new Float64Array(2 * nx);
  }

  forward(map: Float64Array, spectrum: Float64Array): void {
    const { nx, ny, nh } = this;
    checkLength("map", map, nx * ny);
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    const zin = this.rowIn;
    const z = this.rowOut;
    const col = 2 * ny; // doubles per spectrum column
    for (let y = 0; y < ny; y += 2) {
      const hasB = y + 1 < ny;
      const ra = y * nx;
      if (hasB) {
        const rb = ra + nx;
        for (let x = 0; x < nx; x++) {
          zin[2 * x] = map[ra + x] as number;
          zin[2 * x + 1] = map[rb + x] as number;
        }
      } else {
        for (let x = 0; x < nx; x++) {
          zin[2 * x] = map[ra + x] as number;
          zin[2 * x + 1] = 0;
        }
      }
      this.rowFft.transform(zin, 0, z, 0, -1);
      let o = 2 * y;
      for (let k = 0; k < nh; k++, o += col) {
        const nk = k === 0 ? 0 : nx - k;
        const zr = z[2 * k] as number;
        const zi = z[2 * k + 1] as number;
        const cr = z[2 * nk] as number;
        const ci = -(z[2 * nk + 1] as number);
        spectrum[o] = 0.5 * (zr + cr);
        spectrum[o + 1] = 0.5 * (zi + ci);
        if (hasB) {
          spectrum[o + 2] = 0.5 * (zi - ci);
          spectrum[o + 3] = -0.5 * (zr - cr);
        }
      }
    }
    for (let k = 0; k < nh; k++) this.colFft.transform(spectrum, k * col, spectrum, k * col, -1);
  }

  inverse(spectrum: Float64Array, map: Float64Array): void {
    const { nx, ny, nh } = this;
    checkLength("spectrum", spectrum, this.layout.spectrumLength);
    checkLength("map", map, nx * ny);
    if (this.scratch === null) this.scratch = new Float64Array(this.layout.spectrumLength);
    const s = this.scratch;
    const col = 2 * ny;
    for (let k = 0; k < nh; k++) this.colFft.transform(spectrum, k * col, s, k * col, 1);
    const zin = this.rowIn;
    const z = this.rowOut;
    const scale = 1 / (nx * ny);
    const nyq = nx % 2 === 0 ? nx / 2 : -1;
    for (let y = 0; y < ny; y += 2) {
      const hasB = y + 1 < ny;
      let o = 2 * y;
      for (let k = 0; k < nh; k++, o += col) {
        const ar = s[o] as number;
        let ai = s[o + 1] as number;
        let br = 0;
        let bi = 0;
        if (hasB) {
          br = s[o + 2] as number;
          bi = s[o + 3] as number;
        }
        if (k === 0 || k === nyq) {
          ai = 0;
          bi = 0;
        }
        // Z_k = A + iB ; Z_{n−k} = conj(A) + i conj(B)
        zin[2 * k] = ar - bi;
        zin[2 * k + 1] = ai + br;
        if (k > 0 && k !== nyq) {
          const m = 2 * (nx - k);
          zin[m] = ar + bi;
          zin[m + 1] = br - ai;
        }
      }
      this.rowFft.transform(zin, 0, z, 0, 1);
      const ra = y * nx;
      if (hasB) {
        const rb = ra + nx;
        for (let x = 0; x < nx; x++) {
          map[ra + x] = (z[2 * x] as number) * scale;
          map[rb + x] = (z[2 * x + 1] as number) * scale;
        }
      } else {
        for (let x = 0; x < nx; x++) map[ra + x] = (z[2 * x] as number) * scale;
      }
    }
  }
}

const PLAN_CACHE_SIZE = 8;
const planCache = new Map<string, Rfft2PlanF64>();

/**
 * The cached float64 plan for an nx × ny map (nx pixels per row, ny rows), any nx, ny ≥ 1:
 * 5-smooth lengths use our mixed-radix kernel at their own size, others Bluestein; never padded.
 * The cache is per module instance, i.e. per thread (each worker gets its own plans), and keeps the
 * 8 most recently used shapes. A plan holds scratch buffers, so it must not be shared across threads.
 */
export function getRfft2Plan(nx: number, ny: number): Rfft2Plan {
  checkDimension("nx", nx);
  checkDimension("ny", ny);
  const key = `${nx}x${ny}`;
  let plan = planCache.get(key);
  if (plan !== undefined) {
    planCache.delete(key);
    planCache.set(key, plan);
    return plan;
  }
  plan = new Rfft2PlanF64(nx, ny);
  planCache.set(key, plan);
  if (planCache.size > PLAN_CACHE_SIZE) {
    const oldest = planCache.keys().next().value;
    if (oldest !== undefined) planCache.delete(oldest);
  }
  return plan;
}
