/**
 * Cubic splines in the second-derivative form: y(t) = A y_i + B y_{i+1} + ((A³−A) y″_i + (B³−B) y″_{i+1}) h²/6
 * (Press et al. 2007, Numerical Recipes 3rd ed., §3.3, eq. 3.3.3), either natural (y″ = 0 at the
 * ends, solved from the tridiagonal system) or with the knots' second derivatives given.
 */

/** A natural cubic spline: knots, values and second derivatives at the knots. */
export interface NaturalSpline {
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Second derivatives d²y/dx² at the knots (zero at both ends). */
  readonly y2: Float64Array;
}

/** Build the natural cubic spline through (x[i], y[i]); x strictly increasing, at least 2 points. */
export function naturalSpline(xs: ArrayLike<number>, ys: ArrayLike<number>): NaturalSpline {
  const n = xs.length;
  if (n < 2 || ys.length !== n) throw new RangeError("naturalSpline needs at least 2 points and equal lengths");
  const x = Float64Array.from(xs);
  const y = Float64Array.from(ys);
  const y2 = new Float64Array(n);
  const u = new Float64Array(n);
  for (let i = 1; i < n - 1; i++) {
    const sig = (x[i]! - x[i - 1]!) / (x[i + 1]! - x[i - 1]!);
    const p = sig * y2[i - 1]! + 2;
    y2[i] = (sig - 1) / p;
    const d = (y[i + 1]! - y[i]!) / (x[i + 1]! - x[i]!) - (y[i]! - y[i - 1]!) / (x[i]! - x[i - 1]!);
    u[i] = ((6 * d) / (x[i + 1]! - x[i - 1]!) - sig * u[i - 1]!) / p;
  }
  y2[n - 1] = 0;
  for (let k = n - 2; k >= 0; k--) y2[k] = y2[k]! * y2[k + 1]! + u[k]!;
  return { x, y, y2 };
}

/**
 * A cubic spline through (x[i], y[i]) with given second derivatives at the knots (the form in
 * which Tinker et al. 2008, Table 2, publish their interpolation).
 */
export function splineWithSecondDerivatives(xs: ArrayLike<number>, ys: ArrayLike<number>, y2s: ArrayLike<number>): NaturalSpline {
  if (xs.length < 2 || ys.length !== xs.length || y2s.length !== xs.length) throw new RangeError("spline needs at least 2 points and equal lengths");
  return { x: Float64Array.from(xs), y: Float64Array.from(ys), y2: Float64Array.from(y2s) };
}

/** Evaluate a natural spline at `t`; outside the knots the end interval's cubic is continued (callers check their range). */
export function evalSpline(s: NaturalSpline, t: number): number {
  const { x, y, y2 } = s;
  const n = x.length;
  let lo = 0;
  let hi = n - 1;
  if (t <= x[0]!) hi = 1;
  else if (t >= x[n - 1]!) lo = n - 2;
  else {
    while (hi - lo > 1) {
      const mid = (hi + lo) >> 1;
      if (x[mid]! > t) hi = mid;
      else lo = mid;
    }
  }
  if (hi - lo !== 1) hi = lo + 1;
  const h = x[hi]! - x[lo]!;
  const a = (x[hi]! - t) / h;
  const b = (t - x[lo]!) / h;
  return a * y[lo]! + b * y[hi]! + ((a * a * a - a) * y2[lo]! + (b * b * b - b) * y2[hi]!) * (h * h) / 6;
}
