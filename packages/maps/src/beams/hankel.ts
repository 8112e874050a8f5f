/**
 * Zero-order Hankel transforms of spline-interpolated tables,
 * H(k) = ∫_0^{x_max} f(x) J0(k x) w(x) dx, by 8-point Gauss–Legendre on equal panels whose
 * width keeps the phase k·Δx ≤ 3 rad (then the rule's error term, ∝ (kΔx)^17/16!, is below
 * 1e-12) and at most x_max/128 (to resolve f itself).
 */
import { besselJ0 } from "./bessel.js";
import { GL8 } from "./quadrature.js";
import { splineAt } from "./spline.js";
import type { CubicSpline } from "./spline.js";

/**
 * ∫_0^{x_max} s(x) · J0(kFun(x) · scale) · weight(x) dx for a spline s, where the argument of J0
 * is `scale · kFun(x)` (kFun(x) = x for an ordinary Hankel transform).
 */
export function hankelIntegral(
  s: CubicSpline,
  scale: number,
  kFun: (x: number) => number,
  weight: (x: number) => number,
  phaseRate: number,
): number {
  const x0 = s.x[0] as number;
  const xmax = s.x[s.x.length - 1] as number;
  const span = xmax - x0;
  const maxWidth = Math.min(span / 128, phaseRate > 0 ? 3 / phaseRate : Infinity);
  const panels = Math.max(1, Math.ceil(span / maxWidth));
  const width = span / panels;
  let total = 0;
  let interval = 0;
  for (let p = 0; p < panels; p++) {
    const a = x0 + p * width;
    const half = 0.5 * width;
    const mid = a + half;
    let sum = 0;
    for (let q = 0; q < 8; q++) {
      const x = mid + half * (GL8.nodes[q] as number);
      while (interval < s.x.length - 2 && x >= (s.x[interval + 1] as number)) interval++;
      const arg = scale * kFun(x);
      sum += (GL8.weights[q] as number) * splineAt(s, x, interval) * (arg === 0 ? 1 : besselJ0(arg)) * weight(x);
    }
    total += sum * half;
  }
  return total;
}

/** ∫ s(x) · weight(x) dx exactly for polynomial weights of degree ≤ 12 (8-point GL per spline interval). */
export function splineMoment(s: CubicSpline, weight: (x: number) => number): number {
  let total = 0;
  for (let i = 0; i < s.x.length - 1; i++) {
    const a = s.x[i] as number;
    const b = s.x[i + 1] as number;
    const half = 0.5 * (b - a);
    const mid = a + half;
    let sum = 0;
    for (let q = 0; q < 8; q++) {
      const x = mid + half * (GL8.nodes[q] as number);
      sum += (GL8.weights[q] as number) * splineAt(s, x, i) * weight(x);
    }
    total += sum * half;
  }
  return total;
}

