/**
 * Self-similar cluster profile shapes for the matched filter.
 *
 * A shape τ(θ/θs) (τ(0) = 1, θs the scale radius, e.g. θ500) has the 2-D Fourier transform
 * τ̃(ℓ; θs) = ∫ τ(|θ|/θs) e^{−iℓ·θ} d²θ = θs² g(ℓ θs), g(u) = τ̃(u; 1 rad). We tabulate g once
 * on a uniform grid in u and interpolate linearly, so one table serves every size.
 * Self-similarity of the projected profile is exact for a profile truncated at a fixed multiple of
 * θs (Arnaud et al. 2010, A&A 517, A92, for the GNFW shape; common practice).
 */
import { UmbraError } from "@umbra/core";

/** A circularly symmetric profile shape, normalised to 1 at the centre. */
export interface ProfileShape {
  /** Name for provenance, e.g. "gnfw-a10" or "gaussian". */
  readonly name: string;
  /**
   * g(u): the Fourier transform (sr) of the shape at multipole u for a scale of 1 rad,
   * τ̃(ℓ; θs) = θs² g(ℓ θs). Must accept any u ≥ 0.
   */
  fourierUnitScale(u: Float64Array): Float64Array;
}

/** A tabulated {@link ProfileShape}: g on a uniform grid in u, linear interpolation, 0 beyond. */
export interface ProfileTable {
  readonly name: string;
  /** Grid step in u. */
  readonly du: number;
  /** g at u = i·du, i = 0 … length−1 (sr per rad²). */
  readonly g: Float64Array;
  /** g(0) = ∫ τ d²(θ/θs): the profile's integral in units of θs² (Y/y0 = θs² g(0)). */
  readonly integralUnitScale: number;
}

/**
 * Tabulate `shape` for u in [0, uMax] with step `du` (defaults: the range a map of the given
 * ell reach needs for sizes up to `thetaMaxRad`, step 2e-3). Linear interpolation error is
 * ≤ du²·max|g''|/8 (common practice, no source).
 */
export function tabulateProfile(shape: ProfileShape, uMax: number, du = 2e-3): ProfileTable {
  if (!(uMax > 0) || !Number.isFinite(uMax)) throw new UmbraError("BAD_VALUE", `profile table reach u = ${uMax} must be > 0`);
  if (!(du > 0)) throw new UmbraError("BAD_VALUE", `profile table step du = ${du} must be > 0`);
  const n = Math.ceil(uMax / du) + 2;
  const u = new Float64Array(n);
  for (let i = 0; i < n; i++) u[i] = i * du;
  const g = shape.fourierUnitScale(u);
  if (g.length !== n) throw new UmbraError("INTERNAL", `profile '${shape.name}' returned ${g.length} values for ${n} multipoles`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(g[i] as number)) throw new UmbraError("BAD_DATA", `profile '${shape.name}' Fourier transform is not finite at u = ${u[i]}`);
  }
  return { name: shape.name, du, g, integralUnitScale: g[0] as number };
}

/** τ̃(ℓ; θs) / θs² = g(ℓ θs) by linear interpolation in the table; 0 beyond its reach. */
export function profileAt(table: ProfileTable, u: number): number {
  const x = u / table.du;
  const i = Math.floor(x);
  const g = table.g;
  if (i >= g.length - 1) return 0;
  const t = x - i;
  return (g[i] as number) * (1 - t) + (g[i + 1] as number) * t;
}

/**
 * The Gaussian shape τ = exp(−θ²/(2 s²)) with s = `sigmaPerScale`·θs. Its transform is
 * g(u) = 2π s₁² exp(−u² s₁²/2) with s₁ = sigmaPerScale (a textbook Fourier pair; common practice).
 * Used for closed-form checks of the filter.
 */
export function gaussianShape(sigmaPerScale = 1): ProfileShape {
  const s2 = sigmaPerScale * sigmaPerScale;
  return {
    name: `gaussian(${sigmaPerScale})`,
    fourierUnitScale(u) {
      const out = new Float64Array(u.length);
      for (let i = 0; i < u.length; i++) out[i] = 2 * Math.PI * s2 * Math.exp(-0.5 * (u[i] as number) ** 2 * s2);
      return out;
    },
  };
}
