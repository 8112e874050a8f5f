/**
 * Blind cluster search with the multi-frequency matched filter: filter at a grid of sizes, S/N
 * maps, maximum over sizes, peak finding, deblending, a refined fit at each candidate (position
 * fixed at the sub-pixel peak, best size by S/N), and iterative cleaning of the covariance of the
 * detected clusters (detections subtracted, covariance re-estimated, search repeated; Zubeldia,
 * Chluba & Battye 2023, MNRAS 522, 5123, from memory). The threshold applies to the raw S/N.
 */
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import { pixelToWorld } from "@umbra/maps";
import { buildFilterBank, type FilterBank } from "../mmf/bank.js";
import type { ComponentFit } from "../mmf/fit.js";
import { serialFits, type FitRunner } from "../parallel/fitPool.js";
import { tabulateProfile, type ProfileShape, type ProfileTable } from "../mmf/profile.js";
import { localSigmaFactor, whiteNoiseModel, whiteNoiseShares, type WhiteNoiseModel } from "../mmf/localNoise.js";
import { deconvolveBeams, estimateBandCovariance, type CovarianceOptions } from "../noise/estimate.js";
import type { BandCovariance } from "../noise/types.js";
import type { PaintedCluster } from "../photometry/model.js";
import { prepareStack } from "../photometry/prepare.js";
import type { BandStack } from "../stack/types.js";
import { debiasedSnr } from "./debias.js";
import { deblendPeaks, findPeaks } from "./peaks.js";
import { boxContains, type PixelBox } from "../tiles/plan.js";
import type { ProgressCallback } from "../photometry/types.js";

/** Default size grid: 15 sizes log-spaced from 0.5 to 10 arcmin. */
export const DEFAULT_SEARCH_SIZES_ARCMIN: readonly number[] = Array.from({ length: 15 }, (_, i) => 0.5 * Math.pow(20, i / 14));

/** Options of {@link searchClusters}. */
export interface SearchOptions {
  /** Profile shape with θ500 as its scale. */
  readonly profile: ProfileShape;
  /** tSZ SED (K_CMB per unit y, one value per band). */
  readonly tszSed: Float64Array;
  /** Filter sizes θ500 in arcmin (default {@link DEFAULT_SEARCH_SIZES_ARCMIN}). */
  readonly sizesArcmin?: readonly number[];
  /** Raw S/N threshold (default 4.5). */
  readonly snrMin?: number;
  /** SEDs to null in every mode (e.g. CIB/dust). */
  readonly deproject?: readonly Float64Array[];
  /** Cleaning iterations (default 2; 0 = covariance from the raw maps). */
  readonly maxIterations?: number;
  /** Edge taper in arcmin (default 8). */
  readonly apodisationArcmin?: number;
  readonly covarianceOptions?: CovarianceOptions;
  /** Called with each size's S/N map on the last pass (e.g. to write FITS). */
  readonly onSnrMap?: (thetaArcmin: number, snr: Float64Array) => void;
  /** Candidate id prefix (default "cand"). */
  readonly idPrefix?: string;
  /**
   * Report only candidates whose nearest pixel lies in this box (0-based pixels of `stack`), and
   * count only its pixels in the searched area; detections outside still clean the covariance.
   * Used by tiled searches (../tiles/search.ts). Default: the whole map.
   */
  readonly reportBox?: PixelBox;
  /** Called as work advances: stage name, items done, items in the stage (e.g. for a progress bar). */
  readonly onProgress?: ProgressCallback;
  /** Where the refining fits run (default: this thread; see createFitPool for worker threads). Results do not depend on it. */
  readonly fitRunner?: FitRunner;
}

/** One blind candidate. */
export interface Candidate {
  readonly id: string;
  readonly raDeg: number;
  readonly decDeg: number;
  readonly px: number;
  readonly py: number;
  /** 1σ position error per axis, arcmin. */
  readonly positionErrArcmin: number;
  /** Best size and the range of sizes with S/N within 1 of the best (the size–flux degeneracy). */
  readonly theta500Arcmin: number;
  readonly theta500LoArcmin: number;
  readonly theta500HiArcmin: number;
  readonly y0: number;
  readonly y0Err: number;
  readonly yArcmin2: number;
  readonly yErrArcmin2: number;
  /** S/N maximised over position and size (what the threshold uses). */
  readonly snrRaw: number;
  /** sqrt(max(ξ² − 3, 0)), Vanderlinde et al. 2010. */
  readonly snrDebiased: number;
}

/** Result of {@link searchClusters}. */
export interface SearchResult {
  readonly candidates: readonly Candidate[];
  readonly diagnostics: {
    readonly iterations: number;
    readonly sigmaPerSize: readonly { thetaArcmin: number; sigmaY0: number }[];
    readonly maxConditionNumber: number;
    readonly searchedAreaDeg2: number;
    readonly thresholdUses: "raw";
  };
}

interface Raw {
  px: number;
  py: number;
  ix: number;
  iy: number;
  snr: number;
  posErrPix: number;
  sizeIndex: number;
}

function searchPass(
  bank: FilterBank,
  prep: ReturnType<typeof prepareStack>,
  table: ProfileTable,
  sizes: readonly number[],
  snrMin: number,
  allowed: Uint8Array,
  tszSed: Float64Array,
  onSnrMap: SearchOptions["onSnrMap"],
  noise: WhiteNoiseModel | null,
  runner: FitRunner,
): { raws: Raw[]; sigmas: number[] } {
  const { nx, ny } = prep.stack;
  const onMap = onSnrMap === undefined ? undefined : (k: number, map: Float64Array) => onSnrMap(sizes[k] as number, map);
  const { best, arg, sigmas } = runner.bestOverSizes(bank, prep.plan, table, { sed: tszSed, sedKey: "tsz" }, sizes.map((th) => th * RAD_PER_ARCMIN), noise, onMap);
  const peaks = findPeaks(best, nx, ny, snrMin, allowed);
  return {
    raws: peaks.map((p) => ({ px: p.px, py: p.py, ix: p.ix, iy: p.iy, snr: p.snr, posErrPix: p.positionErrPix, sizeIndex: arg[p.iy * nx + p.ix] as number })),
    sigmas: Array.from(sigmas),
  };
}

/** Blind search of `stack` (see module doc). */
export function searchClusters(stack: BandStack, opts: SearchOptions): SearchResult {
  const sizes = opts.sizesArcmin ?? DEFAULT_SEARCH_SIZES_ARCMIN;
  if (sizes.length === 0 || sizes.length > 255) throw new UmbraError("BAD_OPTION", `need 1 to 255 filter sizes, got ${sizes.length}`, { field: "sizes" });
  for (const s of sizes) if (!(s > 0) || !Number.isFinite(s)) throw new UmbraError("BAD_OPTION", `filter size ${s} arcmin must be a positive number`, { field: "sizes" });
  const snrMin = opts.snrMin ?? 4.5;
  if (!(snrMin > 0)) throw new UmbraError("BAD_OPTION", `--snr-min ${snrMin} must be > 0`, { field: "snrMin" });
  if (stack.wcs === null) throw new UmbraError("BAD_DATA", "the band maps carry no celestial WCS: cannot give candidate positions");
  const wcs = stack.wcs;
  const prep = prepareStack(stack, { apodisationArcmin: opts.apodisationArcmin });
  const { nx, ny, geometry } = stack;
  const pixArcmin = Math.sqrt(geometry.dxRad * geometry.dyRad) / RAD_PER_ARCMIN;
  let ellMax = 0;
  for (const l of prep.ells) if (l > ellMax) ellMax = l;
  const table = tabulateProfile(opts.profile, ellMax * Math.max(...sizes) * RAD_PER_ARCMIN * 1.01 + 1);
  const beams = stack.bands.map((b) => b.beam);
  const maxBeam = Math.max(...stack.bands.map((b) => b.beamFwhmArcmin));
  const covFrom = (spectra: readonly Float64Array[]): BandCovariance =>
    estimateBandCovariance(deconvolveBeams(spectra, beams, prep.ells), prep.plan.layout, geometry, prep.ells, {
      windowMeanSquare: prep.windowMeanSquare,
      bandNames: stack.bands.map((b) => b.name),
      beams,
      ...opts.covarianceOptions,
    });
  const bankFor = (cov: BandCovariance): FilterBank =>
    buildFilterBank({ layout: prep.plan.layout, geometry, ells: prep.ells, spectra: prep.spectra, beams, covariance: cov, deproject: opts.deproject });
  // searchable: inside the taper and away from missing/masked pixels by one beam
  const allowed = new Uint8Array(nx * ny);
  let nAllowed = 0;
  const box = opts.reportBox ?? null;
  for (let p = 0; p < allowed.length; p++) {
    allowed[p] = (prep.window[p] as number) >= 0.999 && prep.inpainted[p] === 0 ? 1 : 0;
    if (allowed[p] === 1 && (box === null || boxContains(box, p % nx, Math.floor(p / nx)))) nAllowed++;
  }
  const noise = stack.bands.some((b) => b.ivar !== null) ? whiteNoiseModel(stack.bands.map((b) => b.ivar), prep.window) : null;
  const maxIt = opts.maxIterations ?? 2;
  let cov = covFrom(prep.spectra);
  let bank = bankFor(cov);
  let cands: Candidate[] = [];
  let sigmas: number[] = [];
  let iterations = 0;
  const runner = opts.fitRunner ?? serialFits;
  for (let it = 0; it <= maxIt; it++) {
    const last = it === maxIt;
    opts.onProgress?.(`pass ${it + 1}/${maxIt + 1}`, 0, 2);
    const pass = searchPass(bank, prep, table, sizes, snrMin, allowed, opts.tszSed, last ? opts.onSnrMap : undefined, noise, runner);
    opts.onProgress?.(`pass ${it + 1}/${maxIt + 1}`, 1, 2);
    sigmas = pass.sigmas;
    const kept = deblendPeaks(pass.raws, (k) => Math.max(sizes[k.sizeIndex] as number, maxBeam) / pixArcmin);
    // cleaning passes only need each detection's fit at its best size; the last pass scans all
    const requests = kept.flatMap((r) =>
      sizes.flatMap((th, i) => (last || i === r.sizeIndex ? [{ seds: [opts.tszSed], sedKey: "tsz", thetaRad: th * RAD_PER_ARCMIN, px: r.px, py: r.py }] : [])),
    );
    const fits = runner.fitMany(bank, table, requests);
    opts.onProgress?.(`pass ${it + 1}/${maxIt + 1}`, 2, 2);
    let at = 0;
    cands = kept.flatMap((r, k) => {
      const mine = sizes.map((_, i) => (last || i === r.sizeIndex ? (fits[at++] ?? null) : null));
      const c = refine(bank, table, sizes, r, mine, k, opts.tszSed, noise, nx);
      return c === null ? [] : [c];
    });
    iterations = it;
    if (last) break;
    if (cands.length === 0 && it > 0) break;
    const model: PaintedCluster[] = cands.map((c) => ({
      px: c.px,
      py: c.py,
      thetaRad: c.theta500Arcmin * RAD_PER_ARCMIN,
      bandAmplitudes: opts.tszSed.map((a) => a * c.y0),
    }));
    cov = covFrom(runner.paint(bank, table, prep.spectra, model, -1));
    bank = bankFor(cov);
  }
  const prefix = opts.idPrefix ?? "cand";
  const candidates = cands
    .filter((c) => c.snrRaw >= snrMin && (box === null || boxContains(box, c.px, c.py)))
    .sort((a, b) => b.snrRaw - a.snrRaw)
    .map((c, k) => {
      const w = pixelToWorld(wcs, c.px, c.py);
      return { ...c, id: `${prefix}-${String(k + 1).padStart(4, "0")}`, raDeg: w.lonDeg, decDeg: w.latDeg, positionErrArcmin: c.positionErrArcmin * pixArcmin };
    });
  return {
    candidates,
    diagnostics: {
      iterations,
      sigmaPerSize: sizes.map((t, k) => ({ thetaArcmin: t, sigmaY0: sigmas[k] as number })),
      maxConditionNumber: Math.max(...cov.conditionNumbers),
      searchedAreaDeg2: (nAllowed * pixArcmin * pixArcmin) / 3600,
      thresholdUses: "raw",
    },
  };
}

/**
 * Best size by S/N from the fits at the sub-pixel peak (`fits[i]` at sizes[i], null where not
 * fitted or singular); size range with S/N within 1 of it. Null when no size could be fitted.
 */
function refine(
  bank: FilterBank,
  table: ProfileTable,
  sizes: readonly number[],
  r: Raw,
  fits: readonly (ComponentFit | null)[],
  k: number,
  sed: Float64Array,
  noise: WhiteNoiseModel | null,
  nx: number,
): Candidate | null {
  const snr: number[] = [];
  const errs: number[] = [];
  sizes.forEach((th, i) => {
    const f = fits[i];
    if (f == null) {
      snr.push(-Infinity);
      errs.push(NaN);
      return;
    }
    let err = Math.sqrt(f.covariance[0] as number);
    if (noise !== null) err *= localSigmaFactor(whiteNoiseShares(bank, table, th * RAD_PER_ARCMIN, sed, err, noise.meanVariance), err, noise, r.iy * nx + r.ix);
    errs.push(err);
    snr.push((f.amplitudes[0] as number) / err);
  });
  let b = 0;
  for (let i = 1; i < sizes.length; i++) if ((snr[i] as number) > (snr[b] as number)) b = i;
  let lo = b;
  let hi = b;
  while (lo > 0 && (snr[lo - 1] as number) >= (snr[b] as number) - 1) lo--;
  while (hi < sizes.length - 1 && (snr[hi + 1] as number) >= (snr[b] as number) - 1) hi++;
  const f = fits[b];
  if (f == null) return null;
  const y0 = f.amplitudes[0] as number;
  const y0Err = errs[b] as number;
  const th = sizes[b] as number;
  const area = th * th * table.integralUnitScale;
  // the refined fit at the sub-pixel peak is the raw S/N maximised over position and size
  const raw = snr[b] as number;
  return {
    id: `tmp-${k}`,
    raDeg: NaN,
    decDeg: NaN,
    px: r.px,
    py: r.py,
    positionErrArcmin: r.posErrPix,
    theta500Arcmin: th,
    theta500LoArcmin: sizes[lo] as number,
    theta500HiArcmin: sizes[hi] as number,
    y0,
    y0Err,
    yArcmin2: y0 * area,
    yErrArcmin2: y0Err * area,
    snrRaw: raw,
    snrDebiased: debiasedSnr(raw),
  };
}
