/**
 * The one seeded random generator. Every random draw in umbra goes through an {@link Rng} passed
 * explicitly; the same seed gives the same numbers on every machine, so the same seed gives the
 * same bytes out.
 *
 * Bits come from pure-rand's xoroshiro128+ (Blackman & Vigna 2018); uniform doubles use 53 random
 * bits; normals use the Marsaglia polar method (Marsaglia & Bray 1964, SIAM Review 6, 260);
 * Poisson draws use Knuth's product method for small means and the PTRS transformed rejection of
 * Hörmann 1993 (Insurance: Math. & Econ. 12, 39) for large ones.
 */
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";

/** A seeded source of random numbers (mutable: each call advances it). */
export interface Rng {
  /** Uniform double in [0, 1). */
  uniform(): number;
  /** Standard normal deviate. */
  normal(): number;
  /** Poisson deviate with mean `lambda` ≥ 0. */
  poisson(lambda: number): number;
  /** Fill `out` with independent standard normals; returns `out`. */
  fillNormal(out: Float64Array | Float32Array): Float64Array | Float32Array;
  /** An independent generator derived deterministically from this one's seed and `stream`. */
  fork(stream: number | string): Rng;
  /** The seed this generator was made from (for provenance). */
  readonly seed: number;
}

/** Mix two 32-bit integers into one (a murmur3-style finaliser); used to derive stream seeds. */
function mix32(a: number, b: number): number {
  let h = (a ^ Math.imul(b ^ 0x9e3779b9, 0x85ebca6b)) >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

function hashString(s: string): number {
  let h = 2166136261;
  for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 16777619);
  return h >>> 0;
}

/** Create the generator for `seed` (any integer; taken modulo 2^32). */
export function createRng(seed: number): Rng {
  if (!Number.isInteger(seed)) throw new TypeError(`seed must be an integer, got ${String(seed)}`);
  const seed32 = seed >>> 0;
  const g = xoroshiro128plus(seed32 | 0);
  // discard a few outputs: xoroshiro's first draws from small seeds are poorly mixed
  for (let i = 0; i < 8; i++) g.next();
  let spare = 0;
  let hasSpare = false;

  const uniform = (): number => {
    const hi = (g.next() >>> 0) >>> 6; // 26 bits
    const lo = (g.next() >>> 0) >>> 5; // 27 bits
    return (hi * 134217728 + lo) / 9007199254740992;
  };
  const normal = (): number => {
    if (hasSpare) {
      hasSpare = false;
      return spare;
    }
    let u: number, v: number, s: number;
    do {
      u = 2 * uniform() - 1;
      v = 2 * uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    spare = v * f;
    hasSpare = true;
    return u * f;
  };
  const poisson = (lambda: number): number => {
    if (!(lambda >= 0) || !Number.isFinite(lambda)) throw new RangeError(`Poisson mean must be finite and >= 0, got ${lambda}`);
    if (lambda === 0) return 0;
    if (lambda < 10) {
      const L = Math.exp(-lambda);
      let k = 0;
      let p = uniform();
      while (p > L) {
        k++;
        p *= uniform();
      }
      return k;
    }
    // PTRS (Hörmann 1993)
    const slam = Math.sqrt(lambda);
    const loglam = Math.log(lambda);
    const b = 0.931 + 2.53 * slam;
    const a = -0.059 + 0.02483 * b;
    const invalpha = 1.1239 + 1.1328 / (b - 3.4);
    const vr = 0.9277 - 3.6224 / (b - 2);
    for (;;) {
      const U = uniform() - 0.5;
      const V = uniform();
      const us = 0.5 - Math.abs(U);
      const k = Math.floor(((2 * a) / us + b) * U + lambda + 0.43);
      if (us >= 0.07 && V <= vr) return k;
      if (k < 0 || (us < 0.013 && V > us)) continue;
      if (Math.log(V) + Math.log(invalpha) - Math.log(a / (us * us) + b) <= -lambda + k * loglam - logFactorial(k)) return k;
    }
  };
  return {
    seed: seed32,
    uniform,
    normal,
    poisson,
    fillNormal(out) {
      for (let i = 0; i < out.length; i++) out[i] = normal();
      return out;
    },
    fork(stream) {
      const s = typeof stream === "number" ? stream >>> 0 : hashString(stream);
      return createRng(mix32(seed32, s));
    },
  };
}

/** ln(k!) via Stirling's series for k ≥ 10, exact sums below (absolute error < 1e-10). */
export function logFactorial(k: number): number {
  if (k < 10) {
    let s = 0;
    for (let i = 2; i <= k; i++) s += Math.log(i);
    return s;
  }
  const x = k + 1;
  return (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) + 1 / (12 * x) - 1 / (360 * x ** 3) + 1 / (1260 * x ** 5);
}
