/**
 * Empirical errors from random positions: the same estimator (the single-SED matched filter at a
 * given size) evaluated at N random pixels away from catalogued clusters, masked areas and the
 * tapered edge, on maps from which the fitted catalogue clusters were subtracted (their filtered
 * wings reach several θ500); the scatter of those values is the empirical 1σ of y0, to be set beside the
 * analytic σ from the filter's Fisher matrix (common practice, e.g. Melin, Bartlett &
 * Delabrouille 2006, A&A 459, 341, sec. 4; from memory).
 */
import type { Rng } from "@umbra/core";
import type { Rfft2Plan } from "@umbra/maps";
import type { FilterBank } from "../mmf/bank.js";
import { filteredMap, type SedFilter } from "../mmf/filteredMap.js";
import type { ProfileTable } from "../mmf/profile.js";

/** Empirical and analytic σ at one size. */
export interface RandomScatter {
  readonly thetaRad: number;
  /** Analytic σ of the filter at this size. */
  readonly sigmaAnalytic: number;
  /** Sample standard deviation of the filtered map at the random positions (robust: 1.4826·MAD). */
  readonly sigmaRandom: number;
  /** Number of positions used. */
  readonly count: number;
}

/**
 * For each size in `thetasRad`, filter the map and take the robust scatter (1.4826 × median
 * absolute deviation, Hampel 1974; common practice) at `count` random pixels where `allowed` is 1.
 */
export function randomPositionScatter(
  bank: FilterBank,
  plan: Rfft2Plan,
  table: ProfileTable,
  filter: SedFilter,
  thetasRad: readonly number[],
  allowed: Uint8Array,
  count: number,
  rng: Rng,
): RandomScatter[] {
  const pix: number[] = [];
  for (let p = 0; p < allowed.length; p++) if (allowed[p] === 1) pix.push(p);
  const picks: number[] = [];
  if (pix.length > 0) for (let k = 0; k < count; k++) picks.push(pix[Math.floor(rng.uniform() * pix.length)] as number);
  const map = new Float64Array(bank.nPix);
  const scratch = new Float64Array(bank.layout.spectrumLength);
  return thetasRad.map((thetaRad) => {
    const sigmaAnalytic = filteredMap(bank, plan, table, thetaRad, filter, map, scratch);
    const v = picks.map((p) => map[p] as number);
    return { thetaRad, sigmaAnalytic, sigmaRandom: v.length >= 5 ? robustSigma(v) : NaN, count: v.length };
  });
}

/** 1.4826 × median absolute deviation from the median (Gaussian-consistent robust σ). */
export function robustSigma(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const med = median(s);
  const dev = s.map((v) => Math.abs(v - med)).sort((a, b) => a - b);
  return 1.4826 * median(dev);
}

function median(sorted: readonly number[]): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  return n % 2 === 1 ? (sorted[(n - 1) / 2] as number) : 0.5 * ((sorted[n / 2 - 1] as number) + (sorted[n / 2] as number));
}

/** Allowed pixels for random positions: window = 1, not inpainted, farther than `exclusionPix` from every listed position. */
export function randomAllowedMask(
  nx: number,
  ny: number,
  window: Float64Array,
  inpainted: Uint8Array,
  positions: readonly { px: number; py: number }[],
  exclusionPix: number,
): Uint8Array {
  const ok = new Uint8Array(nx * ny);
  for (let p = 0; p < ok.length; p++) ok[p] = (window[p] as number) >= 0.999 && inpainted[p] === 0 ? 1 : 0;
  const r = Math.ceil(exclusionPix);
  for (const c of positions) {
    if (!Number.isFinite(c.px) || !Number.isFinite(c.py)) continue;
    for (let y = Math.max(0, Math.floor(c.py - r)); y <= Math.min(ny - 1, Math.ceil(c.py + r)); y++) {
      for (let x = Math.max(0, Math.floor(c.px - r)); x <= Math.min(nx - 1, Math.ceil(c.px + r)); x++) {
        if ((x - c.px) ** 2 + (y - c.py) ** 2 <= exclusionPix * exclusionPix) ok[y * nx + x] = 0;
      }
    }
  }
  return ok;
}
