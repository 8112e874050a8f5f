/**
 * Complex FFT of any length n through Bluestein's chirp-z algorithm on top of our mixed-radix
 * kernel (Bluestein 1970, IEEE Trans. Audio Electroacoust. 18, 451; Rabiner, Schafer & Rader 1969,
 * Bell Syst. Tech. J. 48, 1249), batched over lanes like the kernel (see mixed-radix.ts).
 *
 * With jk = (j² + k² − (k−j)²)/2 the forward DFT is X_k = c_k Σ_j (x_j c_j) conj(c_{k−j}) where
 * c_m = exp(−πi m²/n): a convolution, done by FFTs of a 5-smooth length M ≥ 2n−1. The inverse uses
 * DFT₊(x) = conj(DFT₋(conj x)). m² is reduced modulo 2n in integers before the angle is formed, so
 * the chirp keeps full precision for large n.
 */
import { MixedRadixLanes, nextSmooth, type LaneFft } from "./mixed-radix.js";
import { WasmLanes, laneModule } from "./wasm-lanes.js";

/** Bluestein chirp-z FFT, batched over lanes, for any n ≥ 1 (used when n is not 5-smooth). Not re-entrant. */
export class BluesteinLanes implements LaneFft {
  readonly n: number;
  readonly maxLanes: number;
  private readonly m: number;
  private readonly inner: MixedRadixLanes;
  private readonly chirp: Float64Array; // c_k = exp(−πi k²/n), k < n
  private readonly kernelSpectrum: Float64Array; // DFT₋ of b, b_m = conj(c_m) wrapped, scaled by 1/M
  private readonly buf: Float64Array;

  constructor(n: number, maxLanes: number) {
    this.n = n;
    this.maxLanes = maxLanes;
    const m = nextSmooth(2 * n - 1);
    this.m = m;
    this.inner = new MixedRadixLanes(m, maxLanes);
    this.chirp = new Float64Array(2 * n);
    const twoN = 2 * n;
    for (let k = 0; k < n; k++) {
      const k2 = (k * k) % twoN; // exact for k < 9.4e7
      const theta = (Math.PI * k2) / n;
      this.chirp[2 * k] = Math.cos(theta);
      this.chirp[2 * k + 1] = -Math.sin(theta);
    }
    const b = new Float64Array(2 * m);
    for (let k = 0; k < n; k++) {
      const cr = this.chirp[2 * k] as number;
      const ci = -(this.chirp[2 * k + 1] as number);
      b[2 * k] = cr;
      b[2 * k + 1] = ci;
      if (k > 0) {
        b[2 * (m - k)] = cr;
        b[2 * (m - k) + 1] = ci;
      }
    }
    new MixedRadixLanes(m, 1).transform(b, 0, 2, b, 0, 2, 1, -1);
    for (let i = 0; i < 2 * m; i++) b[i] = (b[i] as number) / m;
    this.kernelSpectrum = b;
    this.buf = new Float64Array(2 * m * maxLanes);
  }

  transform(src: Float64Array, so: number, ses: number, dst: Float64Array, dso: number, des: number, lanes: number, dir: 1 | -1): void {
    const n = this.n;
    const m = this.m;
    const a = this.buf;
    const c = this.chirp;
    const L2 = 2 * lanes;
    const conj = dir === 1 ? -1 : 1;
    for (let k = 0; k < n; k++) {
      const cr = c[2 * k] as number;
      const ci = c[2 * k + 1] as number;
      const base = k * L2;
      const sb = so + k * ses;
      for (let v = 0; v < L2; v += 2) {
        const xr = src[sb + v] as number;
        const xi = conj * (src[sb + v + 1] as number);
        a[base + v] = xr * cr - xi * ci;
        a[base + v + 1] = xr * ci + xi * cr;
      }
    }
    a.fill(0, n * L2, m * L2);
    this.inner.transform(a, 0, L2, a, 0, L2, lanes, -1);
    const ks = this.kernelSpectrum;
    for (let k = 0; k < m; k++) {
      const br = ks[2 * k] as number;
      const bi = ks[2 * k + 1] as number;
      const base = k * L2;
      for (let v = 0; v < L2; v += 2) {
        const ar = a[base + v] as number;
        const ai = a[base + v + 1] as number;
        a[base + v] = ar * br - ai * bi;
        a[base + v + 1] = ar * bi + ai * br;
      }
    }
    this.inner.transform(a, 0, L2, a, 0, L2, lanes, 1);
    for (let k = 0; k < n; k++) {
      const cr = c[2 * k] as number;
      const ci = c[2 * k + 1] as number;
      const base = k * L2;
      const db = dso + k * des;
      for (let v = 0; v < L2; v += 2) {
        const ar = a[base + v] as number;
        const ai = a[base + v + 1] as number;
        dst[db + v] = ar * cr - ai * ci;
        dst[db + v + 1] = conj * (ar * ci + ai * cr);
      }
    }
  }
}

/**
 * The batched kernel for length n: mixed radix when n is 5-smooth (in WebAssembly SIMD where
 * available, else the scalar JS kernel; `useWasm = false` forces the latter), Bluestein otherwise.
 */
export function makeLaneFft(n: number, maxLanes: number, useWasm = true): LaneFft {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`FFT length must be a positive integer, got ${n}`);
  if (nextSmooth(n) !== n) return new BluesteinLanes(n, maxLanes);
  return useWasm && laneModule() !== null ? new WasmLanes(n, maxLanes) : new MixedRadixLanes(n, maxLanes);
}

/** A single complex 1-D FFT of length n (one lane), for callers outside the 2-D driver. Not re-entrant. */
export interface ComplexFft {
  readonly n: number;
  /** y[yo …] = DFT_dir of the n complex values at x[xo …] (interleaved re, im); x and y may coincide. */
  transform(x: Float64Array, xo: number, y: Float64Array, yo: number, dir: 1 | -1): void;
}

/** A 1-D complex FFT of any length n ≥ 1 (dir −1 forward, +1 unnormalised inverse). */
export function makeComplexFft(n: number): ComplexFft {
  const kernel = makeLaneFft(n, 1);
  return {
    n,
    transform(x, xo, y, yo, dir) {
      kernel.transform(x, xo, 2, y, yo, 2, 1, dir);
    },
  };
}
