/**
 * Complex FFT of any length n through Bluestein's chirp-z algorithm on top of our mixed-radix
 * kernel (Bluestein 1970, IEEE Trans. Audio Electroacoust. 18, 451; Rabiner, Schafer & Rader 1969,
 * Bell Syst. Tech. J. 48, 1249).
 *
 * With jk = (j² + k² − (k−j)²)/2 the forward DFT is X_k = c_k Σ_j (x_j c_j) conj(c_{k−j}) where
 * c_m = exp(−πi m²/n): a convolution, done by FFTs of a 5-smooth length M ≥ 2n−1. The inverse uses
 * DFT₊(x) = conj(DFT₋(conj x)). m² is reduced modulo 2n in integers before the angle is formed, so
 * the chirp keeps full precision for large n.
 */
import { MixedRadixFft, nextSmooth, type ComplexFft } from "./mixed-radix.js";

/** Bluestein chirp-z FFT for a length that is not 5-smooth (works for any n ≥ 1). Not re-entrant. */
export class BluesteinFft implements ComplexFft {
  readonly n: number;
  private readonly m: number;
  private readonly inner: MixedRadixFft;
  private readonly chirp: Float64Array; // c_k = exp(−πi k²/n), k < n
  private readonly kernelSpectrum: Float64Array; // DFT₋ of b, b_m = conj(c_m) wrapped, scaled by 1/M
  private readonly buf: Float64Array;

  constructor(n: number) {
    this.n = n;
    const m = nextSmooth(2 * n - 1);
    this.m = m;
    this.inner = new MixedRadixFft(m);
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
    this.inner.transform(b, 0, b, 0, -1);
    for (let i = 0; i < 2 * m; i++) b[i] = (b[i] as number) / m;
    this.kernelSpectrum = b;
    this.buf = new Float64Array(2 * m);
  }

  transform(x: Float64Array, xo: number, y: Float64Array, yo: number, dir: 1 | -1): void {
    const n = this.n;
    const m = this.m;
    const a = this.buf;
    const c = this.chirp;
    const conjIn = dir === 1 ? -1 : 1;
    for (let k = 0; k < n; k++) {
      const xr = x[xo + 2 * k] as number;
      const xi = conjIn * (x[xo + 2 * k + 1] as number);
      const cr = c[2 * k] as number;
      const ci = c[2 * k + 1] as number;
      a[2 * k] = xr * cr - xi * ci;
      a[2 * k + 1] = xr * ci + xi * cr;
    }
    a.fill(0, 2 * n);
    this.inner.transform(a, 0, a, 0, -1);
    const ks = this.kernelSpectrum;
    for (let i = 0; i < 2 * m; i += 2) {
      const ar = a[i] as number;
      const ai = a[i + 1] as number;
      const br = ks[i] as number;
      const bi = ks[i + 1] as number;
      a[i] = ar * br - ai * bi;
      a[i + 1] = ar * bi + ai * br;
    }
    this.inner.transform(a, 0, a, 0, 1);
    for (let k = 0; k < n; k++) {
      const ar = a[2 * k] as number;
      const ai = a[2 * k + 1] as number;
      const cr = c[2 * k] as number;
      const ci = c[2 * k + 1] as number;
      y[yo + 2 * k] = ar * cr - ai * ci;
      y[yo + 2 * k + 1] = conjIn * (ar * ci + ai * cr);
    }
  }
}

/** The kernel for length n: mixed radix when n is 5-smooth, Bluestein otherwise. */
export function makeComplexFft(n: number): ComplexFft {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`FFT length must be a positive integer, got ${n}`);
  return nextSmooth(n) === n ? new MixedRadixFft(n) : new BluesteinFft(n);
}
