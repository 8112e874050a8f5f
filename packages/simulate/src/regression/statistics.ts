/**
 * Small statistics used by the regression summary: mean and standard deviation with their errors,
 * Wilson binomial intervals, and a seeded bootstrap.
 */
import type { Rng } from "@umbra/core";
import type { Fraction, ValueWithError } from "./types.js";

/** Sample mean with its standard error s/√n (NaN for n = 0; error NaN for n < 2). */
export function meanWithError(xs: ArrayLike<number>): ValueWithError {
  const n = xs.length;
  if (n === 0) return { value: Number.NaN, error: Number.NaN };
  let m = 0;
  for (let i = 0; i < n; i++) m += xs[i]!;
  m /= n;
  if (n < 2) return { value: m, error: Number.NaN };
  let v = 0;
  for (let i = 0; i < n; i++) v += (xs[i]! - m) ** 2;
  v /= n - 1;
  return { value: m, error: Math.sqrt(v / n) };
}

/**
 * Sample standard deviation (n − 1 normalisation) with its large-sample error s/√(2(n−1)), exact
 * for Gaussian data to leading order (e.g. Barlow 1989, Statistics, §5.3; from memory).
 */
export function stdWithError(xs: ArrayLike<number>): ValueWithError {
  const n = xs.length;
  if (n < 2) return { value: Number.NaN, error: Number.NaN };
  let m = 0;
  for (let i = 0; i < n; i++) m += xs[i]!;
  m /= n;
  let v = 0;
  for (let i = 0; i < n; i++) v += (xs[i]! - m) ** 2;
  const s = Math.sqrt(v / (n - 1));
  return { value: s, error: s / Math.sqrt(2 * (n - 1)) };
}

/**
 * k successes out of n with the Wilson score interval at 68.27 % (z = 1):
 * centre (p + z²/2n)/(1 + z²/n), half-width z√(p(1−p)/n + z²/4n²)/(1 + z²/n)
 * (Wilson 1927, JASA 22, 209). For n = 0 the fraction is NaN and the interval [0, 1].
 */
export function wilsonFraction(k: number, n: number, z = 1): Fraction {
  if (n === 0) return { k, n, fraction: Number.NaN, lower: 0, upper: 1 };
  const p = k / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denom;
  return { k, n, fraction: p, lower: Math.max(0, centre - half), upper: Math.min(1, centre + half) };
}

/** Median of a sample (NaN when empty); does not modify the input. */
export function median(xs: ArrayLike<number>): number {
  if (xs.length === 0) return Number.NaN;
  const s = Float64Array.from(xs).sort();
  const h = s.length >> 1;
  return s.length % 2 === 1 ? s[h]! : 0.5 * (s[h - 1]! + s[h]!);
}

/**
 * A statistic with a bootstrap error: the standard deviation of `stat` over `nResamples`
 * resamples with replacement drawn with `rng` (Efron 1979, Ann. Statist. 7, 1).
 */
export function bootstrap(xs: ArrayLike<number>, stat: (sample: Float64Array) => number, rng: Rng, nResamples = 200): ValueWithError {
  const n = xs.length;
  const value = stat(Float64Array.from(xs));
  if (n < 2) return { value, error: Number.NaN };
  const sample = new Float64Array(n);
  const vals = new Float64Array(nResamples);
  for (let r = 0; r < nResamples; r++) {
    for (let i = 0; i < n; i++) sample[i] = xs[Math.floor(rng.uniform() * n)]!;
    vals[r] = stat(sample);
  }
  return { value, error: stdWithError(vals).value };
}
