/**
 * Cubic spline interpolation of a tabulated function (Press et al. 2007, Numerical Recipes 3rd
 * ed., §3.3): second derivatives from the tridiagonal system, with either a natural start
 * (s'' = 0) or a clamped zero slope (s' = 0, right for a radial profile at θ = 0), and a natural
 * end.
 */
import { UmbraError } from "@umbra/core";

/** A cubic spline through (x_i, y_i). */
export interface CubicSpline {
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Second derivatives at the knots. */
  readonly m: Float64Array;
}

/**
 * Build the spline; `x` strictly increasing (≥ 2 points). `start` = "flat" clamps s'(x_0) = 0,
 * "natural" sets s''(x_0) = 0.
 */
export function cubicSpline(x: Float64Array, y: Float64Array, start: "flat" | "natural"): CubicSpline {
  const n = x.length;
  if (n < 2 || y.length !== n) throw new UmbraError("BAD_DATA", `a spline needs at least 2 points with matching lengths (got ${n}, ${y.length})`);
  for (let i = 1; i < n; i++) {
    if (!((x[i] as number) > (x[i - 1] as number))) throw new UmbraError("BAD_DATA", `abscissae must increase strictly (at index ${i})`, { row: i + 1 });
  }
  const m = new Float64Array(n);
  if (n === 2 && start === "natural") return { x, y, m };
  // Thomas algorithm on rows 0..n-2 (row n-1: natural end, m = 0)
  const diag = new Float64Array(n);
  const upper = new Float64Array(n);
  const rhs = new Float64Array(n);
  const h = (i: number): number => (x[i + 1] as number) - (x[i] as number);
  const slope = (i: number): number => ((y[i + 1] as number) - (y[i] as number)) / h(i);
  if (start === "flat") {
    diag[0] = 2 * h(0);
    upper[0] = h(0);
    rhs[0] = 6 * slope(0);
  } else {
    diag[0] = 1;
    upper[0] = 0;
    rhs[0] = 0;
  }
  for (let i = 1; i < n - 1; i++) {
    const lower = h(i - 1);
    const factor = lower / (diag[i - 1] as number);
    diag[i] = 2 * (h(i - 1) + h(i)) - factor * (upper[i - 1] as number);
    upper[i] = h(i);
    rhs[i] = 6 * (slope(i) - slope(i - 1)) - factor * (rhs[i - 1] as number);
  }
  m[n - 1] = 0;
  for (let i = n - 2; i >= 0; i--) m[i] = ((rhs[i] as number) - (upper[i] as number) * (m[i + 1] as number)) / (diag[i] as number);
  return { x, y, m };
}

/** Index i with x_i ≤ t < x_{i+1} (clamped to the table), by bisection. */
export function findInterval(x: Float64Array, t: number): number {
  let lo = 0;
  let hi = x.length - 1;
  if (t <= (x[0] as number)) return 0;
  if (t >= (x[hi] as number)) return hi - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if ((x[mid] as number) <= t) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Spline value at t (t within [x_0, x_last]; outside, the end cubic is extended). */
export function splineAt(s: CubicSpline, t: number, i: number = findInterval(s.x, t)): number {
  const x0 = s.x[i] as number;
  const x1 = s.x[i + 1] as number;
  const hh = x1 - x0;
  const a = (x1 - t) / hh;
  const b = (t - x0) / hh;
  const m0 = s.m[i] as number;
  const m1 = s.m[i + 1] as number;
  return a * (s.y[i] as number) + b * (s.y[i + 1] as number) + (((a * a * a - a) * m0 + (b * b * b - b) * m1) * hh * hh) / 6;
}
