/**
 * Dimensionless integrals of a {@link PressureProfile} truncated at x = T (T = 5 by default, i.e.
 * 5·R500): the line-of-sight integral at projected radius x, the spherical and cylindrical volume
 * integrals. All lengths in units of R500; multiply by σ_T/(m_e c²)·P500·R500 (line of sight) or
 * σ_T/(m_e c²)·P500·R500³ (volumes) to get y or Y.
 */
import { requireFinite } from "@umbra/core";
import { integrate } from "../numerics/quadrature.js";
import type { PressureProfile } from "./types.js";

/** The default truncation radius in units of R500 (the Y5R500 convention). */
export const DEFAULT_TRUNCATION = 5;

const Q = { rtol: 1e-11, atol: 0, maxPanels: 4000 };

function requireTruncation(t: number): number {
  if (t === Infinity) return t;
  return requireFinite("truncation", t, (v) => v > 0, "not positive");
}

/**
 * The line-of-sight integral ℓ(x) = 2 ∫0^√(T²−x²) p(√(x²+l²)) dl through a sphere of radius T,
 * with p = P/P500 and all lengths in R500 (so y(x) = σ_T/(m_e c²) P500 R500 ℓ(x)). For x > 0 the
 * substitution l = x sinh t makes the integrand smooth; at x = 0, l = T e^{−v} tames the cusp.
 * T may be Infinity for profiles that converge (not for x = 0 with a cusp ≥ 1).
 */
export function lineOfSightIntegral(profile: PressureProfile, x: number, truncation = DEFAULT_TRUNCATION): number {
  const T = requireTruncation(truncation);
  requireFinite("x", x, (v) => v >= 0, "negative");
  if (x >= T) return 0;
  const p = profile.pressureRatio;
  if (x === 0) {
    if (T === Infinity) {
      // ∫0^∞ p(l) dl = ∫ p(e^u) e^u du over u ∈ (−40, ln(1e6)) plus the part beyond, by a second map
      return 2 * (integrate((u) => p(Math.exp(u)) * Math.exp(u), -40, 0, Q) + integrate((s) => (s > 0 ? p(1 / s) / (s * s) : 0), 0, 1, Q));
    }
    // p(l) ~ l^−γ: with l = T e^{−v}, integrand p(l)·l ~ l^{1−γ} decays exponentially in v
    const vMax = 40 / Math.max(1 - profile.cuspSlope, 0.05) + Math.log(Math.max(T, 1));
    return 2 * integrate((v) => {
      const l = T * Math.exp(-v);
      return p(l) * l;
    }, 0, vMax, Q);
  }
  // r = x cosh t, written so that tiny x (down to denormals) neither overflows nor loses digits
  const lx = Math.log(x);
  const tMax = T === Infinity ? 40 - Math.min(lx, 0) : T / x > 1e8 ? Math.log(2 * T) - lx : Math.acosh(T / x);
  return 2 * integrate((t) => {
    const r = 0.5 * Math.exp(t + lx) + 0.5 * x * Math.exp(-t);
    return p(r) * r;
  }, 0, tMax, Q);
}

/**
 * ℓ(x) for every x in `xOverR500` (x = θ/θ500 = r/R500 projected), truncated at T (default 5):
 * the projected shape, with y(θ) = σ_T/(m_e c²) · P500 · R500 · ℓ(θ/θ500).
 */
export function projectedShape(profile: PressureProfile, xOverR500: Float64Array, truncation = DEFAULT_TRUNCATION, out?: Float64Array): Float64Array {
  const res = out ?? new Float64Array(xOverR500.length);
  for (let i = 0; i < xOverR500.length; i++) res[i] = lineOfSightIntegral(profile, xOverR500[i]!, truncation);
  return res;
}

/**
 * Spherical volume integral S(X) = 4π ∫0^min(X,T) p(x) x² dx (dimensionless; Y_sph(X·R500) =
 * σ_T/(m_e c²) P500 R500³ S(X)). A10's I(X) (their eq. 25) is 3 S(X)/(4π).
 */
export function sphericalIntegral(profile: PressureProfile, X: number, truncation = DEFAULT_TRUNCATION): number {
  const T = requireTruncation(truncation);
  requireFinite("X", X, (v) => v >= 0, "negative");
  const top = Math.min(X, T);
  if (top === 0) return 0;
  const p = profile.pressureRatio;
  // x = top·e^{−v} handles the cusp at 0: integrand p(x) x³
  const vMax = 40 / Math.max(3 - profile.cuspSlope, 0.05) + Math.log(Math.max(top, 1));
  return 4 * Math.PI * integrate((v) => {
    const x = top * Math.exp(-v);
    return p(x) * x * x * x;
  }, 0, vMax, Q);
}

/**
 * Cylindrical integral C(X) = 2π ∫0^X x ℓ(x) dx through the sphere truncated at T: the sphere's
 * total minus the part outside the cylinder, C(X) = S(T) − 4π ∫0^√(T²−X²) p(√(X²+s²)) s² ds
 * (r² = X² + s² turns the shell-outside-cylinder integral into a smooth one). X ≥ T gives S(T).
 */
export function cylindricalIntegral(profile: PressureProfile, X: number, truncation = DEFAULT_TRUNCATION): number {
  const T = requireTruncation(truncation);
  requireFinite("X", X, (v) => v >= 0, "negative");
  if (T === Infinity) throw new RangeError("cylindricalIntegral needs a finite truncation");
  const total = sphericalIntegral(profile, T, T);
  if (X >= T) return total;
  if (X === 0) return 0;
  const p = profile.pressureRatio;
  const sMax = Math.sqrt(T * T - X * X);
  const outside = 4 * Math.PI * integrate((s) => p(Math.sqrt(X * X + s * s)) * s * s, 0, sMax, Q);
  return total - outside;
}
