/**
 * Smooth multipole windows for the scale-dependent ILC.
 *
 * A window set is given by its boundaries ℓ_1 < … < ℓ_{n−1} (n windows) and a transition width Δ_j
 * per boundary. Across boundary j, window j falls as cos²(π t/2) and window j+1 rises as
 * sin²(π t/2), t = (ℓ − ℓ_j + Δ_j/2)/Δ_j ∈ [0, 1]; elsewhere a window is 1 inside its range and 0
 * outside. The windows therefore sum LINEARLY to one at every ℓ (Σ_j h_j(ℓ) = 1), which is what a
 * single synthesis y(ℓ) = Σ_j h_j(ℓ) w_jᵀ T(ℓ) needs for unit tSZ response (cosine-edged windows are
 * common practice; the cos²/sin² pair is the same shape as the needlet-style bands of Delabrouille
 * et al. 2009, A&A 493, 835, there squared-summed because they filter twice).
 *
 * Merging two neighbours is removing the boundary between them: h_j + h_{j+1} is again a window of
 * the same kind, and the sum stays one.
 */
import { UmbraError } from "@umbra/core";

/** A set of smooth ell windows (see module doc). */
export interface EllWindowSet {
  /** Boundaries between windows, multipoles, strictly increasing (length n − 1 for n windows). */
  readonly boundariesEll: readonly number[];
  /** Full width of the cos² transition at each boundary, multipoles (same length). */
  readonly transitionsEll: readonly number[];
}

/**
 * Build a window set from boundaries and a relative transition width: Δ_j = fraction·ℓ_j, shrunk
 * where needed so that neighbouring transitions never overlap and none reaches below ℓ = 0.
 */
export function cosineEllWindows(boundariesEll: readonly number[], transitionFraction = 0.5): EllWindowSet {
  const b = [...boundariesEll];
  for (let i = 0; i < b.length; i++) {
    const v = b[i] as number;
    if (!Number.isFinite(v) || v <= 0 || (i > 0 && v <= (b[i - 1] as number))) {
      throw new UmbraError("BAD_OPTION", `ell window boundaries must be positive and strictly increasing, got ${b.join(",")}`, { field: "ell-windows" });
    }
  }
  if (!(transitionFraction > 0 && transitionFraction <= 2)) {
    throw new UmbraError("BAD_OPTION", `transition fraction ${transitionFraction} must be in (0, 2]`, { field: "ell-windows" });
  }
  const t: number[] = [];
  for (let i = 0; i < b.length; i++) {
    const li = b[i] as number;
    let width = transitionFraction * li;
    const gapBelow = i === 0 ? li : li - (b[i - 1] as number);
    const gapAbove = i === b.length - 1 ? Infinity : (b[i + 1] as number) - li;
    // half-widths of neighbours must fit in the gap: use at most half of each gap on this side
    width = Math.min(width, gapBelow, gapAbove);
    t.push(width);
  }
  return { boundariesEll: b, transitionsEll: t };
}

/** Number of windows in a set. */
export function windowCount(set: EllWindowSet): number {
  return set.boundariesEll.length + 1;
}

/** Value of window `j` at multipole `ell` (see module doc for the shape). */
export function windowValue(set: EllWindowSet, j: number, ell: number): number {
  const n = set.boundariesEll.length;
  let v = 1;
  if (j > 0) {
    // rising edge at boundary j−1
    const c = set.boundariesEll[j - 1] as number;
    const d = set.transitionsEll[j - 1] as number;
    const t = (ell - c + d / 2) / d;
    if (t <= 0) return 0;
    if (t < 1) v *= Math.sin((Math.PI / 2) * t) ** 2;
  }
  if (j < n) {
    const c = set.boundariesEll[j] as number;
    const d = set.transitionsEll[j] as number;
    const t = (ell - c + d / 2) / d;
    if (t >= 1) return 0;
    if (t > 0) v *= Math.cos((Math.PI / 2) * t) ** 2;
  }
  return v;
}

/** Window values per mode: one Float64Array (length = ells.length) per window. */
export function windowsOnModes(set: EllWindowSet, ellPerMode: Float64Array): Float64Array[] {
  const out: Float64Array[] = [];
  for (let j = 0; j < windowCount(set); j++) {
    const h = new Float64Array(ellPerMode.length);
    for (let k = 0; k < ellPerMode.length; k++) h[k] = windowValue(set, j, ellPerMode[k] as number);
    out.push(h);
  }
  return out;
}

/** The window set with boundary `index` removed (windows index and index+1 merged). */
export function mergeAtBoundary(set: EllWindowSet, index: number): EllWindowSet {
  return {
    boundariesEll: set.boundariesEll.filter((_, i) => i !== index),
    transitionsEll: set.transitionsEll.filter((_, i) => i !== index),
  };
}

/**
 * Parse "300,800,2000" (boundaries in ell) into a window set; an empty string gives one window.
 * @throws UmbraError BAD_OPTION naming the field `ell-windows`.
 */
export function parseEllWindows(text: string, transitionFraction = 0.5): EllWindowSet {
  const parts = text.split(",").map((s) => s.trim()).filter((s) => s.length > 0);
  const values = parts.map((s) => Number(s));
  if (values.some((v) => !Number.isFinite(v))) {
    throw new UmbraError("BAD_OPTION", `--ell-windows expects comma-separated multipoles, got '${text}'`, { field: "ell-windows" });
  }
  return cosineEllWindows(values, transitionFraction);
}
