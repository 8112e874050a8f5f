/**
 * Our own float64 complex FFT kernel for 5-smooth lengths n = 2^a·3^b·5^c: a self-sorting
 * (Stockham autosort) mixed-radix algorithm with radix-4, 2, 3 and 5 butterflies, so no
 * bit-reversal pass is needed (Stockham 1966, AFIPS 28, 229; formulation of Govindaraju et al.
 * 2008, SC'08, "High performance discrete Fourier transforms on graphics processors", sec. 3).
 *
 * Stage q has radix R and Ns = product of the radices before it. Butterfly j (0 ≤ j < n/R) reads
 * x[j + r·n/R] (r = 0…R−1), multiplies by the twiddles exp(dir·2πi·(j mod Ns)·r/(Ns·R)), applies
 * the R-point DFT and writes y[(j div Ns)·Ns·R + (j mod Ns) + r·Ns]. Stages ping-pong between the
 * data and one work buffer held by the kernel.
 *
 * "Lanes": the kernel transforms L independent sequences at once, stored element-major
 * (element i of lane v at complex index i·L + v). Every butterfly then runs an inner loop over the
 * L lanes with its twiddles loaded once, which is what makes the 2-D driver fast: rows are packed
 * L pairs at a time and columns are taken L at a time (vector-radix style batching; common
 * practice in FFT libraries, no single source).
 *
 * Complex numbers are interleaved (re, im). `dir = −1` is the forward transform
 * Σ x_j exp(−2πi jk/n); `dir = +1` the unnormalised inverse.
 */

/**
 * Batched complex FFTs of one length. `transform(src, so, ses, dst, dso, des, lanes, dir)` reads
 * element i of lane v at src[so + i·ses + 2v] and writes dst[dso + i·des + 2v] (strides in
 * doubles; a compact buffer has ses = 2·lanes). src and dst may be the same region (in place);
 * other overlaps are not allowed. Not re-entrant.
 */
export interface LaneFft {
  readonly n: number;
  readonly maxLanes: number;
  transform(src: Float64Array, so: number, ses: number, dst: Float64Array, dso: number, des: number, lanes: number, dir: 1 | -1): void;
  /** A buffer of 2·n·maxLanes doubles that this kernel transforms in place without copying, when used compactly (element stride 2·lanes, offset 0). */
  laneBuffer?(): Float64Array;
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

/** Mixed-radix Stockham kernel for a 5-smooth length, batched over lanes (see module comment). */
export class MixedRadixLanes implements LaneFft {
  readonly n: number;
  readonly maxLanes: number;
  private readonly radices: number[];
  private readonly strides: number[]; // Ns per stage
  private readonly twOffsets: number[];
  private readonly twFwd: Float64Array; // per stage, per k < Ns: exp(−iθ_r), r = 1…R−1, θ_r = 2π k r/(Ns R)
  private readonly twInv: Float64Array; // conjugates
  private readonly workA: Float64Array;
  private readonly workB: Float64Array;

  constructor(n: number, maxLanes: number) {
    const radices = smoothRadices(n);
    if (radices === null) throw new RangeError(`MixedRadixLanes needs a 5-smooth length, got ${n}`);
    this.n = n;
    this.maxLanes = maxLanes;
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
    this.twFwd = new Float64Array(total);
    this.twInv = new Float64Array(total);
    ns = 1;
    radices.forEach((r, q) => {
      const off = this.twOffsets[q] as number;
      for (let k = 0; k < ns; k++) {
        for (let p = 1; p < r; p++) {
          const theta = (2 * Math.PI * k * p) / (ns * r);
          const i = off + 2 * (k * (r - 1) + p - 1);
          this.twFwd[i] = Math.cos(theta);
          this.twFwd[i + 1] = -Math.sin(theta);
          this.twInv[i] = Math.cos(theta);
          this.twInv[i + 1] = Math.sin(theta);
        }
      }
      ns *= r;
    });
    this.workA = new Float64Array(2 * n * maxLanes);
    this.workB = new Float64Array(radices.length > 2 ? 2 * n * maxLanes : 0);
  }

  transform(src: Float64Array, so: number, ses: number, dst: Float64Array, dso: number, des: number, lanes: number, dir: 1 | -1): void {
    const n = this.n;
    const t = this.radices.length;
    const L2 = 2 * lanes;
    if (t === 0) {
      for (let v = 0; v < L2; v++) dst[dso + v] = src[so + v] as number;
      return;
    }
    const tw = dir === -1 ? this.twFwd : this.twInv;
    // stage 0 reads src, the last stage writes dst, the others ping-pong between the two compact
    // work buffers; a one-stage in-place transform goes through work A and is copied back
    const viaWork = t === 1 && src === dst;
    let x = src;
    let xo = so;
    let xes = ses;
    for (let q = 0; q < t; q++) {
      const last = q === t - 1 && !viaWork;
      const y = last ? dst : q % 2 === 0 ? this.workA : this.workB;
      const yo = last ? dso : 0;
      const yes = last ? des : L2;
      const ns = this.strides[q] as number;
      const to = this.twOffsets[q] as number;
      switch (this.radices[q]) {
        case 4:
          if (ns === 1) first4(n, lanes, x, xo, xes, y, yo, yes, dir);
          else pass4(n, ns, lanes, x, xo, xes, y, yo, yes, tw, to, dir);
          break;
        case 2:
          if (ns === 1) first2(n, lanes, x, xo, xes, y, yo, yes);
          else pass2(n, ns, lanes, x, xo, xes, y, yo, yes, tw, to);
          break;
        case 3:
          pass3(n, ns, lanes, x, xo, xes, y, yo, yes, tw, to, dir);
          break;
        default:
          pass5(n, ns, lanes, x, xo, xes, y, yo, yes, tw, to, dir);
      }
      x = y;
      xo = yo;
      xes = yes;
    }
    if (viaWork) {
      for (let i = 0; i < n; i++) {
        for (let v = 0; v < L2; v++) dst[dso + i * des + v] = this.workA[i * L2 + v] as number;
      }
    }
  }
}

/** First radix-2 stage (Ns = 1: no twiddles). */
function first2(n: number, L: number, x: Float64Array, xo: number, xes: number, y: Float64Array, yo: number, yes: number): void {
  const m = n >> 1;
  const L2 = 2 * L;
  const sx = m * xes;
  for (let j = 0; j < m; j++) {
    const i0 = xo + j * xes;
    const o0 = yo + 2 * j * yes;
    for (let v = 0; v < L2; v += 2) {
      const a = i0 + v;
      const a0r = x[a] as number;
      const a0i = x[a + 1] as number;
      const a1r = x[a + sx] as number;
      const a1i = x[a + sx + 1] as number;
      const o = o0 + v;
      y[o] = a0r + a1r;
      y[o + 1] = a0i + a1i;
      y[o + yes] = a0r - a1r;
      y[o + yes + 1] = a0i - a1i;
    }
  }
}

/** First radix-4 stage (Ns = 1: no twiddles). */
function first4(n: number, L: number, x: Float64Array, xo: number, xes: number, y: Float64Array, yo: number, yes: number, dir: number): void {
  const m = n >> 2;
  const L2 = 2 * L;
  const sx = m * xes;
  for (let j = 0; j < m; j++) {
    const i0 = xo + j * xes;
    const o0 = yo + 4 * j * yes;
    for (let v = 0; v < L2; v += 2) {
      const a = i0 + v;
      const a0r = x[a] as number;
      const a0i = x[a + 1] as number;
      const a1r = x[a + sx] as number;
      const a1i = x[a + sx + 1] as number;
      const a2r = x[a + 2 * sx] as number;
      const a2i = x[a + 2 * sx + 1] as number;
      const a3r = x[a + 3 * sx] as number;
      const a3i = x[a + 3 * sx + 1] as number;
      const t0r = a0r + a2r;
      const t0i = a0i + a2i;
      const t1r = a0r - a2r;
      const t1i = a0i - a2i;
      const t2r = a1r + a3r;
      const t2i = a1i + a3i;
      const t3r = a1r - a3r;
      const t3i = a1i - a3i;
      const o = o0 + v;
      y[o] = t0r + t2r;
      y[o + 1] = t0i + t2i;
      y[o + yes] = t1r - dir * t3i;
      y[o + yes + 1] = t1i + dir * t3r;
      y[o + 2 * yes] = t0r - t2r;
      y[o + 2 * yes + 1] = t0i - t2i;
      y[o + 3 * yes] = t1r + dir * t3i;
      y[o + 3 * yes + 1] = t1i - dir * t3r;
    }
  }
}

function pass2(n: number, ns: number, L: number, x: Float64Array, xo: number, xes: number, y: Float64Array, yo: number, yes: number, tw: Float64Array, to: number): void {
  const m = n >> 1;
  const L2 = 2 * L;
  const sx = m * xes;
  const sy = ns * yes;
  for (let j = 0; j < m; j++) {
    const k = j % ns;
    const i0 = xo + j * xes;
    const o0 = yo + ((j - k) * 2 + k) * yes;
    const t = to + 2 * k;
    const wr = tw[t] as number;
    const wi = tw[t + 1] as number;
    for (let v = 0; v < L2; v += 2) {
      const a = i0 + v;
      const a0r = x[a] as number;
      const a0i = x[a + 1] as number;
      const a1r0 = x[a + sx] as number;
      const a1i0 = x[a + sx + 1] as number;
      const a1r = a1r0 * wr - a1i0 * wi;
      const a1i = a1r0 * wi + a1i0 * wr;
      const o = o0 + v;
      y[o] = a0r + a1r;
      y[o + 1] = a0i + a1i;
      y[o + sy] = a0r - a1r;
      y[o + sy + 1] = a0i - a1i;
    }
  }
}

function pass4(n: number, ns: number, L: number, x: Float64Array, xo: number, xes: number, y: Float64Array, yo: number, yes: number, tw: Float64Array, to: number, dir: number): void {
  const m = n >> 2;
  const L2 = 2 * L;
  const sx = m * xes;
  const sy = ns * yes;
  for (let j = 0; j < m; j++) {
    const k = j % ns;
    const i0 = xo + j * xes;
    const o0 = yo + ((j - k) * 4 + k) * yes;
    const t = to + 6 * k;
    const w1r = tw[t] as number;
    const w1i = tw[t + 1] as number;
    const w2r = tw[t + 2] as number;
    const w2i = tw[t + 3] as number;
    const w3r = tw[t + 4] as number;
    const w3i = tw[t + 5] as number;
    for (let v = 0; v < L2; v += 2) {
      const a = i0 + v;
      const a0r = x[a] as number;
      const a0i = x[a + 1] as number;
      let pr = x[a + sx] as number;
      let pi = x[a + sx + 1] as number;
      const a1r = pr * w1r - pi * w1i;
      const a1i = pr * w1i + pi * w1r;
      pr = x[a + 2 * sx] as number;
      pi = x[a + 2 * sx + 1] as number;
      const a2r = pr * w2r - pi * w2i;
      const a2i = pr * w2i + pi * w2r;
      pr = x[a + 3 * sx] as number;
      pi = x[a + 3 * sx + 1] as number;
      const a3r = pr * w3r - pi * w3i;
      const a3i = pr * w3i + pi * w3r;
      const t0r = a0r + a2r;
      const t0i = a0i + a2i;
      const t1r = a0r - a2r;
      const t1i = a0i - a2i;
      const t2r = a1r + a3r;
      const t2i = a1i + a3i;
      const t3r = a1r - a3r;
      const t3i = a1i - a3i;
      const o = o0 + v;
      y[o] = t0r + t2r;
      y[o + 1] = t0i + t2i;
      y[o + sy] = t1r - dir * t3i;
      y[o + sy + 1] = t1i + dir * t3r;
      y[o + 2 * sy] = t0r - t2r;
      y[o + 2 * sy + 1] = t0i - t2i;
      y[o + 3 * sy] = t1r + dir * t3i;
      y[o + 3 * sy + 1] = t1i - dir * t3r;
    }
  }
}

function pass3(n: number, ns: number, L: number, x: Float64Array, xo: number, xes: number, y: Float64Array, yo: number, yes: number, tw: Float64Array, to: number, dir: number): void {
  const m = (n / 3) | 0;
  const L2 = 2 * L;
  const sx = m * xes;
  const sy = ns * yes;
  const s = dir * SIN60;
  for (let j = 0; j < m; j++) {
    const k = j % ns;
    const i0 = xo + j * xes;
    const o0 = yo + ((j - k) * 3 + k) * yes;
    const t = to + 4 * k;
    const w1r = tw[t] as number;
    const w1i = tw[t + 1] as number;
    const w2r = tw[t + 2] as number;
    const w2i = tw[t + 3] as number;
    for (let v = 0; v < L2; v += 2) {
      const a = i0 + v;
      const a0r = x[a] as number;
      const a0i = x[a + 1] as number;
      let pr = x[a + sx] as number;
      let pi = x[a + sx + 1] as number;
      const a1r = pr * w1r - pi * w1i;
      const a1i = pr * w1i + pi * w1r;
      pr = x[a + 2 * sx] as number;
      pi = x[a + 2 * sx + 1] as number;
      const a2r = pr * w2r - pi * w2i;
      const a2i = pr * w2i + pi * w2r;
      const sr = a1r + a2r;
      const si = a1i + a2i;
      const dr = a1r - a2r;
      const di = a1i - a2i;
      const mr = a0r - 0.5 * sr;
      const mi = a0i - 0.5 * si;
      const o = o0 + v;
      y[o] = a0r + sr;
      y[o + 1] = a0i + si;
      // y1 = m + i·s·d, y2 = m − i·s·d
      y[o + sy] = mr - s * di;
      y[o + sy + 1] = mi + s * dr;
      y[o + 2 * sy] = mr + s * di;
      y[o + 2 * sy + 1] = mi - s * dr;
    }
  }
}

function pass5(n: number, ns: number, L: number, x: Float64Array, xo: number, xes: number, y: Float64Array, yo: number, yes: number, tw: Float64Array, to: number, dir: number): void {
  const m = (n / 5) | 0;
  const L2 = 2 * L;
  const sx = m * xes;
  const sy = ns * yes;
  const s1 = dir * S1;
  const s2 = dir * S2;
  for (let j = 0; j < m; j++) {
    const k = j % ns;
    const i0 = xo + j * xes;
    const o0 = yo + ((j - k) * 5 + k) * yes;
    const t = to + 8 * k;
    const w1r = tw[t] as number;
    const w1i = tw[t + 1] as number;
    const w2r = tw[t + 2] as number;
    const w2i = tw[t + 3] as number;
    const w3r = tw[t + 4] as number;
    const w3i = tw[t + 5] as number;
    const w4r = tw[t + 6] as number;
    const w4i = tw[t + 7] as number;
    for (let v = 0; v < L2; v += 2) {
      const a = i0 + v;
      const a0r = x[a] as number;
      const a0i = x[a + 1] as number;
      let pr = x[a + sx] as number;
      let pi = x[a + sx + 1] as number;
      const a1r = pr * w1r - pi * w1i;
      const a1i = pr * w1i + pi * w1r;
      pr = x[a + 2 * sx] as number;
      pi = x[a + 2 * sx + 1] as number;
      const a2r = pr * w2r - pi * w2i;
      const a2i = pr * w2i + pi * w2r;
      pr = x[a + 3 * sx] as number;
      pi = x[a + 3 * sx + 1] as number;
      const a3r = pr * w3r - pi * w3i;
      const a3i = pr * w3i + pi * w3r;
      pr = x[a + 4 * sx] as number;
      pi = x[a + 4 * sx + 1] as number;
      const a4r = pr * w4r - pi * w4i;
      const a4i = pr * w4i + pi * w4r;
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
      const o = o0 + v;
      y[o] = a0r + p1r + p2r;
      y[o + 1] = a0i + p1i + p2i;
      // y1 = b1 + i e1, y4 = b1 − i e1, y2 = b2 + i e2, y3 = b2 − i e2
      y[o + sy] = b1r - e1i;
      y[o + sy + 1] = b1i + e1r;
      y[o + 4 * sy] = b1r + e1i;
      y[o + 4 * sy + 1] = b1i - e1r;
      y[o + 2 * sy] = b2r - e2i;
      y[o + 2 * sy + 1] = b2i + e2r;
      y[o + 3 * sy] = b2r + e2i;
      y[o + 3 * sy + 1] = b2i - e2r;
    }
  }
}
