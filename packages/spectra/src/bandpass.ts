/**
 * Tabulated bandpasses: validation and the quadrature that integrates a spectrum against one.
 *
 * Convention (docs/spectra.md): the transmission τ(ν) is per unit frequency, applied to specific
 * intensity, and linear between its samples; the band signal of a sky spectrum S is ∫ τ(ν) S(ν) dν.
 * Each interval between samples is integrated with Gauss–Legendre (enough points that a smooth S
 * times the linear τ is integrated to rounding), so a top-hat given by two samples integrates a
 * power law to machine precision.
 */
import { UmbraError } from "@umbra/core";
import { gaussLegendre } from "./gaussLegendre.js";
import type { BandSpec, Bandpass, Spectrum } from "./types.js";

/** Quadrature nodes (GHz) and weights (τ·dν, GHz) that represent ∫ τ(ν) f(ν) dν ≈ Σ wᵢ f(νᵢ). */
export interface BandQuadrature {
  readonly frequencyGHz: Float64Array;
  readonly weight: Float64Array;
  /** The MJy/sr reference frequency of the band (see {@link Bandpass}). */
  readonly refFrequencyGHz: number;
}

const quadCache = new WeakMap<Bandpass, BandQuadrature>();

/** Total quadrature points aimed for across the band; at least 3 and at most 32 per interval. */
const TARGET_POINTS = 256;

/**
 * Check a bandpass: equal lengths ≥ 2, frequencies finite, > 0 and strictly increasing, weights
 * finite and ≥ 0 and not all zero. Throws a BAD_VALUE {@link UmbraError} naming the band and row.
 */
export function validateBandpass(bandpass: Bandpass): void {
  const { frequencyGHz: f, weight: w } = bandpass;
  const band = bandpass.name;
  if (f.length !== w.length) {
    throw new UmbraError("BAD_VALUE", `bandpass has ${f.length} frequencies but ${w.length} weights`, { band });
  }
  if (f.length < 2) throw new UmbraError("BAD_VALUE", "bandpass needs at least two samples", { band });
  let any = false;
  for (let i = 0; i < f.length; i++) {
    const fi = f[i] as number;
    const wi = w[i] as number;
    if (!Number.isFinite(fi) || fi <= 0) {
      throw new UmbraError("BAD_VALUE", `bandpass frequency ${String(fi)} GHz is not a positive finite number`, { band, row: i + 1 });
    }
    if (i > 0 && !(fi > (f[i - 1] as number))) {
      throw new UmbraError("BAD_VALUE", "bandpass frequencies must be strictly increasing", { band, row: i + 1 });
    }
    if (!Number.isFinite(wi) || wi < 0) {
      throw new UmbraError("BAD_VALUE", `bandpass weight ${String(wi)} is not a finite number ≥ 0`, { band, row: i + 1 });
    }
    if (wi > 0) any = true;
  }
  if (!any) throw new UmbraError("BAD_VALUE", "bandpass weights are all zero", { band });
  if (bandpass.refFrequencyGHz !== undefined && !(bandpass.refFrequencyGHz > 0 && Number.isFinite(bandpass.refFrequencyGHz))) {
    throw new UmbraError("BAD_VALUE", `reference frequency ${String(bandpass.refFrequencyGHz)} GHz is not positive`, {
      band,
      field: "refFrequencyGHz",
    });
  }
}

/**
 * The quadrature for a bandpass (validated, built once per bandpass object and cached). Each
 * interval [νᵢ, νᵢ₊₁] gets an n-point Gauss–Legendre rule (n = clamp(⌈256/intervals⌉, 3, 32)),
 * with τ interpolated linearly; intervals where τ is zero at both ends are skipped.
 */
export function bandQuadrature(bandpass: Bandpass): BandQuadrature {
  const hit = quadCache.get(bandpass);
  if (hit !== undefined) return hit;
  validateBandpass(bandpass);
  const f = bandpass.frequencyGHz;
  const w = bandpass.weight;
  const nInt = f.length - 1;
  const n = Math.min(32, Math.max(3, Math.ceil(TARGET_POINTS / nInt)));
  const rule = gaussLegendre(n);
  let count = 0;
  for (let i = 0; i < nInt; i++) if ((w[i] as number) > 0 || (w[i + 1] as number) > 0) count += n;
  const nu = new Float64Array(count);
  const wt = new Float64Array(count);
  let k = 0;
  let s0 = 0;
  let s1 = 0;
  for (let i = 0; i < nInt; i++) {
    const a = f[i] as number;
    const b = f[i + 1] as number;
    const wa = w[i] as number;
    const wb = w[i + 1] as number;
    if (wa === 0 && wb === 0) continue;
    const half = 0.5 * (b - a);
    const mid = 0.5 * (a + b);
    for (let j = 0; j < n; j++) {
      const t = rule.nodes[j] as number;
      const v = mid + half * t;
      const tau = wa + ((wb - wa) * (v - a)) / (b - a);
      nu[k] = v;
      wt[k] = tau * half * (rule.weights[j] as number);
      s0 += wt[k] as number;
      s1 += (wt[k] as number) * v;
      k++;
    }
  }
  const quad: BandQuadrature = { frequencyGHz: nu, weight: wt, refFrequencyGHz: bandpass.refFrequencyGHz ?? s1 / s0 };
  quadCache.set(bandpass, quad);
  return quad;
}

/** True when the band is a tabulated bandpass rather than a delta function. */
export function isBandpassBand(band: BandSpec): band is { readonly bandpass: Bandpass } {
  return "bandpass" in band;
}

/**
 * The nominal frequency of a band in GHz: the delta frequency, or the bandpass reference frequency
 * (default ∫τν dν/∫τ dν). Validates delta frequencies (finite, > 0).
 */
export function bandReferenceFrequency(band: BandSpec): number {
  if (isBandpassBand(band)) return bandQuadrature(band.bandpass).refFrequencyGHz;
  const f = band.frequencyGHz;
  if (!Number.isFinite(f) || f <= 0) {
    throw new UmbraError("BAD_VALUE", `frequency ${String(f)} GHz is not a positive finite number`, { field: "frequencyGHz", value: f });
  }
  return f;
}

/**
 * Band average of a spectrum: ∫ τ(ν) S(ν) dν (GHz · MJy/sr) for a bandpass, or S(ν) for a delta
 * band (the delta band's τ is normalised to unit area). Only ratios of such integrals are physical.
 */
export function bandIntegral(band: BandSpec, spectrum: Spectrum): number {
  if (!isBandpassBand(band)) return spectrum(bandReferenceFrequency(band));
  const q = bandQuadrature(band.bandpass);
  let s = 0;
  for (let i = 0; i < q.frequencyGHz.length; i++) s += (q.weight[i] as number) * spectrum(q.frequencyGHz[i] as number);
  return s;
}

/**
 * Effective frequency of a spectrum in a band, ν_eff = ∫τ ν S dν / ∫τ S dν in GHz (common
 * practice, no source); a delta band returns its frequency. Undefined (NaN) when ∫τS = 0.
 */
export function effectiveFrequency(band: BandSpec, spectrum: Spectrum): number {
  if (!isBandpassBand(band)) return bandReferenceFrequency(band);
  const num = bandIntegral(band, (nu) => nu * spectrum(nu));
  const den = bandIntegral(band, spectrum);
  return den === 0 ? Number.NaN : num / den;
}
