/**
 * The filter-size loop of a blind search as a batch: for each size, the filtered map, its σ and the
 * S/N map (with the local white-noise correction when ivar maps are given), kept as the maximum
 * over sizes and the size that gave it. Several threads can run it at once: each takes sizes from
 * a shared counter and keeps its own maximum ("slot"); the slots are merged afterwards, ties going
 * to the smaller size index, so the result is that of one thread running the sizes in order.
 */
import { takeItems } from "./counter.js";
import type { Rfft2Plan } from "@umbra/maps";
import type { FitBank } from "../mmf/fit.js";
import { filteredMap, type SedFilter } from "../mmf/filteredMap.js";
import { localSigmaFactor, whiteNoiseShares, type WhiteNoiseModel } from "../mmf/localNoise.js";
import type { ProfileTable } from "../mmf/profile.js";

/** The arrays a size batch shares between threads. */
export interface SizeArrays {
  /** [next size to take, sizes finished, sizes finished by worker threads (slots > 0)]. */
  readonly control: Int32Array;
  /** σ of each size's filtered map (units of the SED's amplitude). */
  readonly sigmas: Float64Array;
  /** Per thread slot: the best S/N at each pixel over the sizes it ran, and that size's index. */
  readonly best: readonly Float64Array[];
  readonly arg: readonly Uint8Array[];
}

/** Allocate a batch for `nSizes` sizes, `npix` pixels and `slots` threads (SharedArrayBuffers when `shared`). */
export function sizeArrays(nSizes: number, npix: number, slots: number, shared: boolean): SizeArrays {
  const buf = (bytes: number) => (shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
  return {
    control: new Int32Array(buf(12)),
    sigmas: new Float64Array(buf(8 * nSizes)),
    best: Array.from({ length: slots }, () => new Float64Array(buf(8 * npix)).fill(-Infinity)),
    arg: Array.from({ length: slots }, () => new Uint8Array(buf(npix))),
  };
}

/**
 * Fill `map` with the S/N of the filter at scale `thetaRad` (ŷ/σ, σ scaled by the local white-noise
 * factor when `noise` is given); returns σ. `scratch` is a spectrum-sized buffer.
 */
export function snrMap(bank: FitBank, plan: Rfft2Plan, table: ProfileTable, thetaRad: number, filter: SedFilter, noise: WhiteNoiseModel | null, map: Float64Array, scratch: Float64Array): number {
  const sigma = filteredMap(bank, plan, table, thetaRad, filter, map, scratch);
  const shares = noise === null ? null : whiteNoiseShares(bank, table, thetaRad, filter.sed, sigma, noise.meanVariance);
  for (let p = 0; p < map.length; p++) {
    const local = shares === null || noise === null ? sigma : sigma * localSigmaFactor(shares, sigma, noise, p);
    map[p] = (map[p] as number) / local;
  }
  return sigma;
}

/**
 * Take sizes until none is left and fold each S/N map into slot `slot`'s maximum; `onMap` (this
 * thread only) sees each map. Returns how many sizes this thread ran.
 */
export function runSizeTasks(
  bank: FitBank,
  plan: Rfft2Plan,
  table: ProfileTable,
  filter: SedFilter,
  sizesRad: Float64Array,
  noise: WhiteNoiseModel | null,
  a: SizeArrays,
  slot: number,
  onMap?: (k: number, snr: Float64Array) => void,
): number {
  const npix = plan.nx * plan.ny;
  const map = new Float64Array(npix);
  const scratch = new Float64Array(plan.layout.spectrumLength);
  const best = a.best[slot] as Float64Array;
  const arg = a.arg[slot] as Uint8Array;
  return takeItems(a.control, sizesRad.length, slot > 0, (k) => {
    a.sigmas[k] = snrMap(bank, plan, table, sizesRad[k] as number, filter, noise, map, scratch);
    for (let p = 0; p < npix; p++) {
      const s = map[p] as number;
      // sizes come in increasing order within a thread, so ">" keeps the smaller index on ties
      if (s > (best[p] as number)) {
        best[p] = s;
        arg[p] = k;
      }
    }
    onMap?.(k, map);
    return 1;
  });
}

/** Merge the slots: per pixel the largest S/N and its size index (the smaller index on ties). */
export function mergeSizeSlots(a: SizeArrays): { best: Float64Array; arg: Uint8Array } {
  const best = Float64Array.from(a.best[0] as Float64Array);
  const arg = Uint8Array.from(a.arg[0] as Uint8Array);
  for (let t = 1; t < a.best.length; t++) {
    const bt = a.best[t] as Float64Array;
    const at = a.arg[t] as Uint8Array;
    for (let p = 0; p < best.length; p++) {
      const s = bt[p] as number;
      const b = best[p] as number;
      if (s > b || (s === b && (at[p] as number) < (arg[p] as number))) {
        best[p] = s;
        arg[p] = at[p] as number;
      }
    }
  }
  return { best, arg };
}
