/**
 * Our own float64 complex FFT kernel for 5-smooth lengths n = 2^a·3^b·5^c: a self-sorting
 * (Stockham autosort) mixed-radix algorithm with radix-4, 2, 3 and 5 butterflies, so no
 * bit-reversal pass is needed (Stockham 1966, AFIPS 28, 229; formulation of Govindaraju et al.
 * 2008, SC'08, "High performance discrete Fourier transforms on graphics processors", sec. 3).
 *
 * Stage q has radix R and Ns = product of the radices before it. Butterfly j (0 ≤ j < n/R) reads
 * x[j + r·n/R] (r = 0…R−1), multiplies by the twiddles exp(dir·2πi·(j mod Ns)·r/(Ns·R)), applies
 * the R-point DFT and writes y[(j div Ns)·Ns·R + (j mod Ns) + r·Ns]. Stages ping-pong between the
 * destination and one work buffer held by the kernel.
 *
 * Complex numbers are interleaved (re, im). `dir = −1` is the forward transform
 * Σ x_j exp(−2πi jk/n); `dir = +1` the unnormalised inverse.
 */

/** A complex 1-D FFT of one fixed length. Holds twiddles and a work buffer: not re-entrant. */
export interface ComplexFft {
  readonly n: number;
  /**
   * y = DFT_dir(x) for the n complex values at x[xo …] (interleaved), written to y[yo …].
   * `x` and `y` may be the same array at the same offset (in place); partial overlap is not allowed.
   */
  transform(x: Float64Array, xo: number, y: Float64Array, yo: number, dir: 1 | -1): void;
}

/** Radices of a 5-smooth n in the order the stages run (4s first, then 2, 3, 5); null when n is not 5-smooth. */
export function smoothRadices(n: number): number[] | null {
  if (!Number.isInteger(n) || n < 1) return null;
  const out: number[] = [];
  let m = n;
  while (m % 4 === 0) {
    out.push(4);
    m /= 4;
  }
  if (m % 2 === 0) {
    out.push(2);
    m /= 2;
  }
  while (m % 3 === 0) {
    out.push(3);
    m /= 3;
  }
  while (m % 5 === 0) {
    out.push(5);
    m /= 5;
  }
  return m === 1 ? out : null;
}

/** Smallest 2^a·3^b·5^c ≥ n. */
export function nextSmooth(n: number): number {
  let m = Math.max(1, Math.ceil(n));
  while (smoothRadices(m) === null) m++;
  return m;
}

const SIN60 = Math.sqrt(3) / 2;
const C1 = Math.cos((2 * Math.PI) / 5);
const C2 = Math.cos((4 * Math.PI) / 5);
const S1 = Math.sin((2 * Math.PI) / 5);
const S2 = Math.sin((4 * Math.PI) / 5);

/** Mixed-radix Stockham kernel for a 5-smooth length (see module comment). */
export class MixedRadixFft implements ComplexFft {
  readonly n: number;
  private readonly radices: number[];
  private readonly strides: number[]; // Ns per stage
  private readonly twOffsets: number[];
  private readonly tw: Float64Array; // per stage, per k < Ns: (cos θ_r, sin θ_r) for r = 1…R−1, θ_r = 2π k r/(Ns R)
  private readonly work: Float64Array;

  constructor(n: number) {
    const radices = smoothRadices(n);
    if (radices === null) throw new RangeError(`MixedRadixFft needs a 5-smooth length, got ${n}`);
    this.n = n;
    this.radices = radices;
    this.strides = [];
    this.twOffsets = [];
    let total = 0;
    let ns = 1;
    for (const r of radices) {
      this.strides.push(ns);
      this.twOffsets.push(total);
      total += ns * 2 * (r - 1);
      ns *= r;
    }
    this.tw = new Float64Array(total);
    ns = 1;
    radices.forEach((r, q) => {
      const off = this.twOffsets[q] as number;
      for (let k = 0; k < ns; k++) {
        for (let p = 1; p < r; p++) {
          const theta = (2 * Math.PI * k * p) / (ns * r);
          this.tw[off + 2 * (k * (r - 1) + p - 1)] = Math.cos(theta);
          this.tw[off + 2 * (k * (r - 1) + p - 1) + 1] = Math.sin(theta);
        }
      }
      ns *= r;
    });
    this.work = new Float64Array(2 * n);
  }

  transform(x: Float64Array, xo: number, y: Float64Array, yo: number, dir: 1 | -1): void {
    const n = this.n;
    const t = this.radices.length;
    if (t === 0) {
      y[yo] = x[xo] as number;
      y[yo + 1] = x[xo + 1] as number;
      return;
    }
    const work = this.work;
    let src = x;
    let so = xo;
    // stage q writes y when (t − 1 − q) is even, else work, so the last stage lands in y
    if (t % 2 === 1 && x === y) {
      // first stage would read and write y: start from a copy
      work.set(x.subarray(xo, xo + 2 * n));
      src = work;
      so = 0;
    }
    for (let q = 0; q < t; q++) {
      const toY = (t - 1 - q) % 2 === 0;
      const dst = toY ? y : work;
      const dO = toY ? yo : 0;
      const ns = this.strides[q] as number;
      const to = this.twOffsets[q] as number;
      switch (this.radices[q]) {
        case 4:
          pass4(n, ns, src, so, dst, dO, this.tw, to, dir);
          break;
        case 2:
          pass2(n, ns, src, so, dst, dO, this.tw, to, dir);
          break;
        case 3:
          pass3(n, ns, src, so, dst, dO, this.tw, to, dir);
          break;
        default:
          pass5(n, ns, src, so, dst, dO, this.tw, to, dir);
      }
      src = dst;
      so = dO;
    }
  }
}

function pass2(n: number, ns: number, x: Float64Array, xo: number, y: Float64Array, yo: number, tw: Float64Array, to: number, dir: number): void {
  const m = n >> 1;
  const blocks = m / ns;
  const sx = 2 * m;
  for (let b = 0; b < blocks; b++) {
    let i0 = xo + 2 * b * ns;
    let o0 = yo + 4 * b * ns;
    let t = to;
    for (let k = 0; k < ns; k++, i0 += 2, o0 += 2, t += 2) {
      const a0r = x[i0] as number;
      const a0i = x[i0 + 1] as number;
      let a1r = x[i0 + sx] as number;
      let a1i = x[i0 + sx + 1] as number;
      if (ns > 1) {
        const wr = tw[t] as number;
        const wi = dir * (tw[t + 1] as number);
        const r = a1r * wr - a1i * wi;
        a1i = a1r * wi + a1i * wr;
        a1r = r;
      }
      y[o0] = a0r + a1r;
      y[o0 + 1] = a0i + a1i;
      y[o0 + 2 * ns] = a0r - a1r;
      y[o0 + 2 * ns + 1] = a0i - a1i;
    }
  }
}

function pass4(n: number, ns: number, x: Float64Array, xo: number, y: Float64Array, yo: number, tw: Float64Array, to: number, dir: number): void {
  const m = n >> 2;
  const blocks = m / ns;
  const sx = 2 * m;
  const sy = 2 * ns;
  for (let b = 0; b < blocks; b++) {
    let i0 = xo + 2 * b * ns;
    let o0 = yo + 8 * b * ns;
    let t = to;
    for (let k = 0; k < ns; k++, i0 += 2, o0 += 2, t += 6) {
      const a0r = x[i0] as number;
      const a0i = x[i0 + 1] as number;
      let a1r = x[i0 + sx] as number;
      let a1i = x[i0 + sx + 1] as number;
      let a2r = x[i0 + 2 * sx] as number;
      let a2i = x[i0 + 2 * sx + 1] as number;
      let a3r = x[i0 + 3 * sx] as number;
      let a3i = x[i0 + 3 * sx + 1] as number;
      if (ns > 1) {
        let wr = tw[t] as number;
        let wi = dir * (tw[t + 1] as number);
        let r = a1r * wr - a1i * wi;
        a1i = a1r * wi + a1i * wr;
        a1r = r;
        wr = tw[t + 2] as number;
        wi = dir * (tw[t + 3] as number);
        r = a2r * wr - a2i * wi;
        a2i = a2r * wi + a2i * wr;
        a2r = r;
        wr = tw[t + 4] as number;
        wi = dir * (tw[t + 5] as number);
        r = a3r * wr - a3i * wi;
        a3i = a3r * wi + a3i * wr;
        a3r = r;
      }
      const t0r = a0r + a2r;
      const t0i = a0i + a2i;
      const t1r = a0r - a2r;
      const t1i = a0i - a2i;
      const t2r = a1r + a3r;
      const t2i = a1i + a3i;
      const t3r = a1r - a3r;
      const t3i = a1i - a3i;
      y[o0] = t0r + t2r;
      y[o0 + 1] = t0i + t2i;
      y[o0 + sy] = t1r - dir * t3i;
      y[o0 + sy + 1] = t1i + dir * t3r;
      y[o0 + 2 * sy] = t0r - t2r;
      y[o0 + 2 * sy + 1] = t0i - t2i;
      y[o0 + 3 * sy] = t1r + dir * t3i;
      y[o0 + 3 * sy + 1] = t1i - dir * t3r;
    }
  }
}

function pass3(n: number, ns: number, x: Float64Array, xo: number, y: Float64Array, yo: number, tw: Float64Array, to: number, dir: number): void {
  const m = n / 3;
  const blocks = m / ns;
  const sx = 2 * m;
  const sy = 2 * ns;
  const s = dir * SIN60;
  for (let b = 0; b < blocks; b++) {
    let i0 = xo + 2 * b * ns;
    let o0 = yo + 6 * b * ns;
    let t = to;
    for (let k = 0; k < ns; k++, i0 += 2, o0 += 2, t += 4) {
      const a0r = x[i0] as number;
      const a0i = x[i0 + 1] as number;
      let a1r = x[i0 + sx] as number;
      let a1i = x[i0 + sx + 1] as number;
      let a2r = x[i0 + 2 * sx] as number;
      let a2i = x[i0 + 2 * sx + 1] as number;
      if (ns > 1) {
        let wr = tw[t] as number;
        let wi = dir * (tw[t + 1] as number);
        let r = a1r * wr - a1i * wi;
        a1i = a1r * wi + a1i * wr;
        a1r = r;
        wr = tw[t + 2] as number;
        wi = dir * (tw[t + 3] as number);
        r = a2r * wr - a2i * wi;
        a2i = a2r * wi + a2i * wr;
        a2r = r;
      }
      const sr = a1r + a2r;
      const si = a1i + a2i;
      const dr = a1r - a2r;
      const di = a1i - a2i;
      const mr = a0r - 0.5 * sr;
      const mi = a0i - 0.5 * si;
      y[o0] = a0r + sr;
      y[o0 + 1] = a0i + si;
      // y1 = m + i·s·d, y2 = m − i·s·d
      y[o0 + sy] = mr - s * di;
      y[o0 + sy + 1] = mi + s * dr;
      y[o0 + 2 * sy] = mr + s * di;
      y[o0 + 2 * sy + 1] = mi - s * dr;
    }
  }
}

function pass5(n: number, ns: number, x: Float64Array, xo: number, y: Float64Array, yo: number, tw: Float64Array, to: number, dir: number): void {
  const m = n / 5;
  const blocks = m / ns;
  const sx = 2 * m;
  const sy = 2 * ns;
  const s1 = dir * S1;
  const s2 = dir * S2;
  for (let b = 0; b < blocks; b++) {
    let i0 = xo + 2 * b * ns;
    let o0 = yo + 10 * b * ns;
    let t = to;
    for (let k = 0; k < ns; k++, i0 += 2, o0 += 2, t += 8) {
      const a0r = x[i0] as number;
      const a0i = x[i0 + 1] as number;
      let a1r = x[i0 + sx] as number;
      let a1i = x[i0 + sx + 1] as number;
      let a2r = x[i0 + 2 * sx] as number;
      let a2i = x[i0 + 2 * sx + 1] as number;
      let a3r = x[i0 + 3 * sx] as number;
      let a3i = x[i0 + 3 * sx + 1] as number;
      let a4r = x[i0 + 4 * sx] as number;
      let a4i = x[i0 + 4 * sx + 1] as number;
      if (ns > 1) {
        let wr = tw[t] as number;
        let wi = dir * (tw[t + 1] as number);
        let r = a1r * wr - a1i * wi;
        a1i = a1r * wi + a1i * wr;
        a1r = r;
        wr = tw[t + 2] as number;
        wi = dir * (tw[t + 3] as number);
        r = a2r * wr - a2i * wi;
        a2i = a2r * wi + a2i * wr;
        a2r = r;
        wr = tw[t + 4] as number;
        wi = dir * (tw[t + 5] as number);
        r = a3r * wr - a3i * wi;
        a3i = a3r * wi + a3i * wr;
        a3r = r;
        wr = tw[t + 6] as number;
        wi = dir * (tw[t + 7] as number);
        r = a4r * wr - a4i * wi;
        a4i = a4r * wi + a4i * wr;
        a4r = r;
      }
      const p1r = a1r + a4r;
      const p1i = a1i + a4i;
      const d1r = a1r - a4r;
      const d1i = a1i - a4i;
      const p2r = a2r + a3r;
      const p2i = a2i + a3i;
      const d2r = a2r - a3r;
      const d2i = a2i - a3i;
      const b1r = a0r + C1 * p1r + C2 * p2r;
      const b1i = a0i + C1 * p1i + C2 * p2i;
      const b2r = a0r + C2 * p1r + C1 * p2r;
      const b2i = a0i + C2 * p1i + C1 * p2i;
      const e1r = s1 * d1r + s2 * d2r;
      const e1i = s1 * d1i + s2 * d2i;
      const e2r = s2 * d1r - s1 * d2r;
      const e2i = s2 * d1i - s1 * d2i;
      y[o0] = a0r + p1r + p2r;
      y[o0 + 1] = a0i + p1i + p2i;
      // y1 = b1 + i e1, y4 = b1 − i e1, y2 = b2 + i e2, y3 = b2 − i e2
      y[o0 + sy] = b1r - e1i;
      y[o0 + sy + 1] = b1i + e1r;
      y[o0 + 4 * sy] = b1r + e1i;
      y[o0 + 4 * sy + 1] = b1i - e1r;
      y[o0 + 2 * sy] = b2r - e2i;
      y[o0 + 2 * sy + 1] = b2i + e2r;
      y[o0 + 3 * sy] = b2r + e2i;
      y[o0 + 3 * sy + 1] = b2i - e2r;
    }
  }
}
