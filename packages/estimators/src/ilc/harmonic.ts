/**
 * The ILC in Fourier space on a partition of the multipole range into smooth windows (one window =
 * the standard or constrained ILC over all scales; several = the scale-dependent ILC).
 *
 * For window j with values h_j(ℓ) (see windows.ts; Σ_j h_j = 1), the band covariance is
 *   R_j[a,b] = Σ_k d_k h_j(ℓ_k)² Re(S_a(k) S_b(k)*) r_a(k) r_b(k) / Σ_k d_k h_j(ℓ_k)²,
 * with S the spectra used for the covariance, d_k the real degrees of freedom of stored mode k
 * (hermitianWeight) and r_a(k) = B_eff(ℓ)/B_a(ℓ) the transfer that brings band a to the common
 * effective beam. The weights w_j follow from R_j and the constraints (weights.ts), and the output is
 *   Y(k) = Σ_j h_j(ℓ_k) Σ_a w_j[a] r_a(k) T_a(k),
 * which has unit response to the target at every ℓ because the windows sum linearly to one. The
 * ℓ = 0 mode (the maps' arbitrary offsets) is left out of the covariance and set to zero in the
 * output. Windows whose ILC bias fraction (m − k)/N_p exceeds the limit are merged with their
 * neighbour with fewer modes until all pass or one window is left (Delabrouille et al. 2009,
 * A&A 493, 835, on the ILC bias).
 */
import type { SpectrumLayout } from "@umbra/maps";
import { UmbraError } from "@umbra/core";
import { effectiveModeCount, ilcBiasFraction } from "./bias.js";
import { checkCovariance, combinedVariance, constrainedIlcWeights } from "./weights.js";
import { mergeAtBoundary, windowCount, windowsOnModes, type EllWindowSet } from "./windows.js";


/** Inputs of {@link harmonicIlc}. All per-band arrays are in the same band order. */
export interface HarmonicIlcInput {
  layout: SpectrumLayout;
  /** Multipole ℓ = 2π|k| of every stored mode (length layout.modeCount). */
  ellPerMode: Float64Array;
  /** Spectra (interleaved re, im) from which the covariance is estimated, e.g. of apodised maps. */
  covarianceSpectra: readonly Float64Array[];
  /** Spectra combined into the output; may be the same arrays as covarianceSpectra. */
  synthesisSpectra: readonly Float64Array[];
  /** Per band and mode, B_eff(ℓ)/B_band(ℓ); a non-finite value drops the mode from every band. */
  beamRatio: readonly Float64Array[];
  /** Constraint SEDs (length m each, map unit per unit of component); the first is the target (unit response), the rest get zero response. */
  constraints: readonly Float64Array[];
  /** Initial windows; merged as needed to respect maxBiasFraction. */
  windows: EllWindowSet;
  /** Largest acceptable ILC bias fraction per window (default 0.01). */
  maxBiasFraction?: number;
  /** Factor ≤ 1 on the mode count for apodisation (⟨w²⟩²/⟨w⁴⟩ of the window; 1 without). */
  modeFactor?: number;
  /** Band names, for reports and error messages. */
  bandNames?: readonly string[];
}

/** What the ILC did in one ell window. */
export interface IlcDomainReport {
  index: number;
  /** Multipole range where the window is non-zero (ellMax = Infinity for the last). */
  ellMin: number;
  ellMax: number;
  /** Effective number of independent real modes N_p in the covariance estimate. */
  independentModes: number;
  /** Predicted fraction of the target cancelled, (m − k)/N_p. */
  biasFraction: number;
  /** Weights per band, (target unit) per (map unit). */
  weights: number[];
  /** Condition number of the window's band covariance, and of its correlation matrix. */
  conditionNumber: number;
  correlationConditionNumber: number;
  /** wᵀ R w: mean output power per mode in the window (spectrum units²). */
  outputPowerPerMode: number;
}

/** Output of {@link harmonicIlc}. */
export interface HarmonicIlcResult {
  /** Output spectrum (interleaved re, im, same layout) of the combined map. */
  spectrum: Float64Array;
  /** Output spectrum combined from the covariance spectra (for the noise power), or the same array when they coincide. */
  covarianceOutputSpectrum: Float64Array;
  /** Windows actually used, after merging. */
  windows: EllWindowSet;
  /** Number of merges done to respect the bias limit. */
  merges: number;
  domains: IlcDomainReport[];
  /** True when every window's bias fraction is within the limit. */
  biasWithinLimit: boolean;
  maxBiasFraction: number;
}

function usableModes(input: Pick<HarmonicIlcInput, "layout" | "ellPerMode" | "beamRatio">): Uint8Array {
  const n = input.layout.modeCount;
  const ok = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    let good = (input.ellPerMode[k] as number) > 0 ? 1 : 0;
    for (const r of input.beamRatio) if (!Number.isFinite(r[k] as number)) good = 0;
    ok[k] = good;
  }
  return ok;
}

function modeCounts(input: HarmonicIlcInput, set: EllWindowSet, ok: Uint8Array): { hs: Float64Array[]; counts: number[] } {
  const hs = windowsOnModes(set, input.ellPerMode);
  const dof = input.layout.hermitianWeight;
  const counts: number[] = [];
  const u = new Float64Array(dof.length);
  for (const h of hs) {
    for (let k = 0; k < u.length; k++) u[k] = ok[k] ? (h[k] as number) ** 2 : 0;
    counts.push(effectiveModeCount(dof, u) * (input.modeFactor ?? 1));
  }
  return { hs, counts };
}

function windowCovariance(input: HarmonicIlcInput, h: Float64Array, ok: Uint8Array): Float64Array {
  const m = input.covarianceSpectra.length;
  const cov = new Float64Array(m * m);
  const dof = input.layout.hermitianWeight;
  const re = new Float64Array(m);
  const im = new Float64Array(m);
  let norm = 0;
  for (let k = 0; k < input.layout.modeCount; k++) {
    const hk = h[k] as number;
    if (hk === 0 || !ok[k]) continue;
    const u = (dof[k] as number) * hk * hk;
    norm += u;
    for (let a = 0; a < m; a++) {
      const s = input.covarianceSpectra[a] as Float64Array;
      const r = (input.beamRatio[a] as Float64Array)[k] as number;
      re[a] = (s[2 * k] as number) * r;
      im[a] = (s[2 * k + 1] as number) * r;
    }
    for (let a = 0; a < m; a++) {
      for (let b = a; b < m; b++) cov[a * m + b] = (cov[a * m + b] as number) + u * ((re[a] as number) * (re[b] as number) + (im[a] as number) * (im[b] as number));
    }
  }
  if (norm === 0) return cov.fill(NaN);
  for (let a = 0; a < m; a++) {
    for (let b = a; b < m; b++) {
      const v = (cov[a * m + b] as number) / norm;
      cov[a * m + b] = v;
      cov[b * m + a] = v;
    }
  }
  return cov;
}

function windowSupport(set: EllWindowSet, j: number): [number, number] {
  const n = set.boundariesEll.length;
  const lo = j === 0 ? 0 : (set.boundariesEll[j - 1] as number) - (set.transitionsEll[j - 1] as number) / 2;
  const hi = j === n ? Infinity : (set.boundariesEll[j] as number) + (set.transitionsEll[j] as number) / 2;
  return [lo, hi];
}

function combine(spectra: readonly Float64Array[], layout: SpectrumLayout, beamRatio: readonly Float64Array[], hs: Float64Array[], weights: readonly Float64Array[], ok: Uint8Array): Float64Array {
  const m = spectra.length;
  const out = new Float64Array(layout.spectrumLength);
  const wk = new Float64Array(m);
  for (let k = 0; k < layout.modeCount; k++) {
    if (!ok[k]) continue;
    wk.fill(0);
    for (let j = 0; j < hs.length; j++) {
      const hk = (hs[j] as Float64Array)[k] as number;
      if (hk === 0) continue;
      const w = weights[j] as Float64Array;
      for (let a = 0; a < m; a++) wk[a] = (wk[a] as number) + hk * (w[a] as number);
    }
    let re = 0;
    let im = 0;
    for (let a = 0; a < m; a++) {
      const c = (wk[a] as number) * ((beamRatio[a] as Float64Array)[k] as number);
      const s = spectra[a] as Float64Array;
      re += c * (s[2 * k] as number);
      im += c * (s[2 * k + 1] as number);
    }
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  return out;
}

/**
 * Apply given per-window weights to other spectra (e.g. noise-only simulations or one component
 * alone): Y(k) = Σ_j h_j(ℓ_k) Σ_a w_j[a] r_a(k) T_a(k), with the ℓ = 0 mode and modes with a
 * non-finite beam ratio set to zero, exactly as {@link harmonicIlc} combines its own data.
 */
export function combineWithWeights(
  spectra: readonly Float64Array[],
  layout: SpectrumLayout,
  ellPerMode: Float64Array,
  beamRatio: readonly Float64Array[],
  windows: EllWindowSet,
  weights: readonly Float64Array[],
): Float64Array {
  if (weights.length !== windowCount(windows)) throw new UmbraError("INTERNAL", `${weights.length} weight vectors for ${windowCount(windows)} windows`);
  const ok = usableModes({ layout, ellPerMode, beamRatio });
  return combine(spectra, layout, beamRatio, windowsOnModes(windows, ellPerMode), weights, ok);
}

/**
 * Run the (scale-dependent, constrained) ILC in Fourier space; see the module doc for the formulas.
 * @throws UmbraError BAD_DATA when a window's covariance is not positive definite or the constraints are degenerate.
 */
export function harmonicIlc(input: HarmonicIlcInput): HarmonicIlcResult {
  const m = input.covarianceSpectra.length;
  if (m === 0 || input.synthesisSpectra.length !== m || input.beamRatio.length !== m) {
    throw new UmbraError("INTERNAL", "harmonicIlc: band arrays disagree in length");
  }
  const maxBias = input.maxBiasFraction ?? 0.01;
  const k = input.constraints.length;
  const ok = usableModes(input);
  let set = input.windows;
  let merges = 0;
  let { hs, counts } = modeCounts(input, set, ok);
  for (;;) {
    const fractions = counts.map((c) => ilcBiasFraction(m, k, c));
    let worst = 0;
    for (let j = 1; j < fractions.length; j++) if ((fractions[j] as number) > (fractions[worst] as number)) worst = j;
    if ((fractions[worst] as number) <= maxBias || windowCount(set) === 1) break;
    // merge with the neighbour holding fewer modes
    const below = worst > 0 ? (counts[worst - 1] as number) : Infinity;
    const above = worst < counts.length - 1 ? (counts[worst + 1] as number) : Infinity;
    set = mergeAtBoundary(set, below <= above ? worst - 1 : worst);
    merges++;
    ({ hs, counts } = modeCounts(input, set, ok));
  }
  const weights: Float64Array[] = [];
  const domains: IlcDomainReport[] = [];
  for (let j = 0; j < hs.length; j++) {
    const cov = windowCovariance(input, hs[j] as Float64Array, ok);
    const label = `ell window ${j}`;
    const check = checkCovariance(cov);
    const w = constrainedIlcWeights(cov, input.constraints, label);
    weights.push(w);
    const [ellMin, ellMax] = windowSupport(set, j);
    const np = counts[j] as number;
    domains.push({
      index: j,
      ellMin,
      ellMax,
      independentModes: np,
      biasFraction: ilcBiasFraction(m, k, np),
      weights: Array.from(w),
      conditionNumber: check.conditionNumber,
      correlationConditionNumber: check.correlationConditionNumber,
      outputPowerPerMode: combinedVariance(cov, w),
    });
  }
  const spectrum = combine(input.synthesisSpectra, input.layout, input.beamRatio, hs, weights, ok);
  const covarianceOutputSpectrum =
    input.synthesisSpectra === input.covarianceSpectra ? spectrum : combine(input.covarianceSpectra, input.layout, input.beamRatio, hs, weights, ok);
  return {
    spectrum,
    covarianceOutputSpectrum,
    windows: set,
    merges,
    domains,
    biasWithinLimit: domains.every((d) => d.biasFraction <= maxBias),
    maxBiasFraction: maxBias,
  };
}
