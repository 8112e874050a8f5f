/**
 * Peak finding on an S/N map: strict local maxima over the 8 neighbours above a threshold, with
 * a sub-pixel position from a parabola through the peak and its neighbours along each axis, and a
 * 1σ position error from the curvature of ½ξ² (the profile log-likelihood of position for a
 * matched filter; common practice, from memory).
 */

/** One local maximum. */
export interface Peak {
  /** Pixel of the maximum. */
  readonly ix: number;
  readonly iy: number;
  /** Sub-pixel position (0-based). */
  readonly px: number;
  readonly py: number;
  /** S/N at the pixel. */
  readonly snr: number;
  /** 1σ position error per axis in pixels (RMS of x and y), NaN when the curvature is not negative. */
  readonly positionErrPix: number;
}

/** Parabola vertex offset and curvature through (−1, a), (0, b), (1, c). */
function parabola(a: number, b: number, c: number): { off: number; curv: number } {
  const curv = a - 2 * b + c; // second difference (negative at a maximum)
  const off = curv < 0 ? (0.5 * (a - c)) / curv : 0;
  return { off: Math.max(-0.5, Math.min(0.5, off)), curv };
}

/** Local maxima of `snr` (nx × ny) with value ≥ threshold where `allowed` is 1 (or everywhere when null). */
export function findPeaks(snr: Float64Array, nx: number, ny: number, threshold: number, allowed: Uint8Array | null): Peak[] {
  const peaks: Peak[] = [];
  for (let y = 1; y < ny - 1; y++) {
    for (let x = 1; x < nx - 1; x++) {
      const p = y * nx + x;
      const v = snr[p] as number;
      if (!(v >= threshold)) continue;
      if (allowed !== null && allowed[p] !== 1) continue;
      let isMax = true;
      for (let dy = -1; dy <= 1 && isMax; dy++) {
        for (let dx = -1; dx <= 1; dx++) {
          if (dx === 0 && dy === 0) continue;
          const q = p + dy * nx + dx;
          const w = snr[q] as number;
          // strict on one side so a flat pair gives one peak
          if (w > v || (w === v && q < p)) {
            isMax = false;
            break;
          }
        }
      }
      if (!isMax) continue;
      const hx = parabola(snr[p - 1] as number, v, snr[p + 1] as number);
      const hy = parabola(snr[p - nx] as number, v, snr[p + nx] as number);
      const sx = hx.curv < 0 ? 1 / Math.sqrt(-v * hx.curv) : NaN;
      const sy = hy.curv < 0 ? 1 / Math.sqrt(-v * hy.curv) : NaN;
      peaks.push({ ix: x, iy: y, px: x + hx.off, py: y + hy.off, snr: v, positionErrPix: Math.sqrt(0.5 * (sx * sx + sy * sy)) });
    }
  }
  return peaks.sort((a, b) => b.snr - a.snr);
}

/**
 * Deblend: keep peaks in decreasing S/N; drop a peak closer than `radiusPix(stronger)` to an
 * already kept stronger one (it is that cluster's own side lobe or size-scan shoulder).
 */
export function deblendPeaks<T extends { px: number; py: number; snr: number }>(peaks: readonly T[], radiusPix: (kept: T) => number): T[] {
  const kept: T[] = [];
  const sorted = [...peaks].sort((a, b) => b.snr - a.snr);
  for (const p of sorted) {
    let ok = true;
    for (const k of kept) {
      const r = radiusPix(k);
      if ((p.px - k.px) ** 2 + (p.py - k.py) ** 2 < r * r) {
        ok = false;
        break;
      }
    }
    if (ok) kept.push(p);
  }
  return kept;
}
