/**
 * Forced photometry with the multi-frequency matched filter at catalogue positions, with the
 * noise + foreground covariance estimated from the maps and cleaned iteratively of the clusters
 * (first-pass fit of every catalogued cluster subtracted, covariance re-estimated, clusters
 * re-fitted, until the fits change by less than `tolerance` σ; Zubeldia, Chluba & Battye 2023,
 * MNRAS 522, 5123, from memory). The fit itself: ../mmf/fit.ts (Herranz et al. 2002, MNRAS 336,
 * 1057; Melin, Bartlett & Delabrouille 2006, A&A 459, 341).
 */
import { RAD_PER_ARCMIN, UmbraError, createRng } from "@umbra/core";
import { worldToPixel } from "@umbra/maps";
import { buildFilterBank, rewhitenBank, type FilterBank } from "../mmf/bank.js";
import { serialFits, type FitRunner } from "../parallel/fitPool.js";
import type { FitRequest } from "../parallel/fitBatch.js";
import { prepareSedFilter } from "../mmf/filteredMap.js";
import { tabulateProfile, type ProfileTable } from "../mmf/profile.js";
import { filterRadialProfile, type FilterRadialProfile } from "../mmf/filterProfile.js";
import { detectPointSources, type PointSource } from "../sources/detect.js";
import { localSigmaFactor, whiteNoiseModel, whiteNoiseShares } from "../mmf/localNoise.js";
import { deconvolveBeams, estimateBandCovariance } from "../noise/estimate.js";
import type { BandCovariance } from "../noise/types.js";
import type { BandStack } from "../stack/types.js";
import { ELECTRON_REST_ENERGY_KEV, SPEED_OF_LIGHT_MPS } from "@umbra/spectra";
import { FATAL_FLAGS, positionFlags, type ClusterFlag } from "./flags.js";
import type { PaintedCluster } from "./model.js";
import { massesFromY, type MassOutcome } from "./masses.js";
import { prepareStack, type PreparedStack } from "./prepare.js";
import { randomAllowedMask, randomPositionScatter, type RandomScatter } from "./randoms.js";
import type { CatalogueCluster, ClusterMeasurement, MeasureOptions, MeasureResult, ScanPoint } from "./types.js";

/** Speed of light in km/s (from the CODATA module of @umbra/spectra). */
const C_KMS = SPEED_OF_LIGHT_MPS / 1000;

/** Default scan: 15 sizes log-spaced from 0.5 to 10 arcmin. */
export const DEFAULT_SCAN_SIZES_ARCMIN: readonly number[] = Array.from({ length: 15 }, (_, i) => 0.5 * Math.pow(20, i / 14));

interface Target {
  readonly c: CatalogueCluster;
  readonly px: number;
  readonly py: number;
  readonly thetaArcmin: number | null;
  readonly thetaSource: "catalog" | "mass" | "scan";
  /** kTe of the tSZ SED (0 = non-relativistic). */
  readonly teKeV: number;
  /** kTe known for the cluster (catalogue or M–T), 0 when unknown: converts kSZ to a velocity. */
  readonly knownTeKeV: number;
  readonly flags: ClusterFlag[];
  readonly seds: Float64Array[];
  /** Key of the SED set (same key ⇒ same SED arrays). */
  readonly sedKey: string;
}

interface TargetFit {
  thetaArcmin: number;
  amplitudes: Float64Array;
  covariance: Float64Array;
  scan: ScanPoint[] | null;
}

function resolveTargets(stack: BandStack, prep: PreparedStack, clusters: readonly CatalogueCluster[], opts: MeasureOptions): Target[] {
  const wcs = stack.wcs;
  if (wcs === null) throw new UmbraError("BAD_DATA", "the band maps carry no celestial WCS: cannot place catalogue positions");
  const pixArcmin = Math.sqrt(stack.geometry.dxRad * stack.geometry.dyRad) / RAD_PER_ARCMIN;
  const maxBeam = Math.max(...stack.bands.map((b) => b.beamFwhmArcmin));
  const relativistic = opts.relativistic ?? true;
  const sedCache = new Map<number, Float64Array>();
  const tsz = (kte: number): Float64Array => {
    let s = sedCache.get(kte);
    if (s === undefined) {
      s = opts.seds.tsz(kte);
      sedCache.set(kte, s);
    }
    return s;
  };
  return clusters.map((c) => {
    const flags: ClusterFlag[] = [];
    const pos = Number.isFinite(c.raDeg) && Number.isFinite(c.decDeg) ? worldToPixel(wcs, c.raDeg, c.decDeg) : { ix: NaN, iy: NaN };
    let thetaArcmin: number | null = null;
    let thetaSource: Target["thetaSource"] = "scan";
    const hasMass = c.m500Msun != null && c.z != null && (c.m500Msun as number) > 0 && (c.z as number) > 0;
    if (c.theta500Arcmin != null && (c.theta500Arcmin as number) > 0) {
      thetaArcmin = c.theta500Arcmin as number;
      thetaSource = "catalog";
    } else if (hasMass && opts.physics?.theta500ArcminFromMass !== undefined) {
      thetaArcmin = opts.physics.theta500ArcminFromMass(c.m500Msun as number, c.z as number);
      thetaSource = "mass";
    }
    // the electron temperature: from the catalogue, else the M–T relation; it sets the
    // relativistic tSZ SED (unless switched off) and converts a kSZ amplitude to a velocity
    let knownTeKeV = 0;
    if (c.teKeV != null && (c.teKeV as number) > 0) knownTeKeV = c.teKeV as number;
    else if (hasMass && opts.physics?.temperatureKeVFromMass !== undefined) knownTeKeV = opts.physics.temperatureKeVFromMass(c.m500Msun as number, c.z as number);
    const teKeV = relativistic ? knownTeKeV : 0;
    const radiusArcmin = Math.max(thetaArcmin ?? 2, maxBeam);
    flags.push(...positionFlags(pos.ix, pos.iy, radiusArcmin / pixArcmin, stack.nx, stack.ny, prep.window, prep.inpainted));
    const seds = [tsz(teKeV)];
    if (opts.fitKsz === true) seds.push(opts.seds.ksz());
    return { c, px: pos.ix, py: pos.iy, thetaArcmin, thetaSource, teKeV, knownTeKeV, flags, seds, sedKey: `${teKeV}|${opts.fitKsz === true ? "ksz" : ""}` };
  });
}

function isFatal(flags: readonly ClusterFlag[]): boolean {
  return flags.some((f) => FATAL_FLAGS.includes(f));
}

/** Y5R500/y0 in arcmin² for θ500 in arcmin: θ500² g(0) (g(0) in units of the scale², see ../mmf/profile.ts). */
export function yOverY0Arcmin2(table: ProfileTable, thetaArcmin: number): number {
  return thetaArcmin * thetaArcmin * table.integralUnitScale;
}

/** Clusters that are fitted for the covariance cleaning although their result is not reported (only `edge`). */
function fitForCleaning(t: Target): boolean {
  return !isFatal(t.flags) || (t.flags.includes("edge") && !t.flags.includes("off_map") && !t.flags.includes("masked"));
}

/**
 * First fit of every target (clusters that are reported, and edge clusters fitted for the cleaning
 * only): at its θ500, or at each scan size keeping the best S/N. One batch on `runner`; a target
 * with a singular fit gets null.
 */
function fitAll(bank: FilterBank, table: ProfileTable, targets: readonly Target[], scanSizes: readonly number[], runner: FitRunner, onProgress: MeasureOptions["onProgress"]): (TargetFit | null)[] {
  const requests: FitRequest[] = [];
  const first: number[] = [];
  targets.forEach((t) => {
    first.push(requests.length);
    if (!fitForCleaning(t)) return;
    for (const th of t.thetaArcmin !== null ? [t.thetaArcmin] : scanSizes) requests.push({ seds: t.seds, sedKey: t.sedKey, thetaRad: th * RAD_PER_ARCMIN, px: t.px, py: t.py });
  });
  onProgress?.("first fit", 0, 1);
  const fits = runner.fitMany(bank, table, requests);
  onProgress?.("first fit", 1, 1);
  return targets.map((t, n) => {
    if (!fitForCleaning(t)) return null;
    const r0 = first[n] as number;
    if (t.thetaArcmin !== null) {
      const f = fits[r0];
      return f == null ? null : { thetaArcmin: t.thetaArcmin, amplitudes: f.amplitudes, covariance: f.covariance, scan: null };
    }
    let best: TargetFit | null = null;
    let bestSnr = -Infinity;
    const scan: ScanPoint[] = [];
    for (let q = 0; q < scanSizes.length; q++) {
      const f = fits[r0 + q];
      if (f == null) return null;
      const th = scanSizes[q] as number;
      const y0 = f.amplitudes[0] as number;
      const err = Math.sqrt(f.covariance[0] as number);
      const area = yOverY0Arcmin2(table, th);
      scan.push({ theta500Arcmin: th, y0, y0Err: err, yArcmin2: y0 * area, yErrArcmin2: err * area, snr: y0 / err });
      if (y0 / err > bestSnr) {
        bestSnr = y0 / err;
        best = { thetaArcmin: th, amplitudes: f.amplitudes, covariance: f.covariance, scan };
      }
    }
    return best;
  });
}

function painted(targets: readonly Target[], fits: readonly (TargetFit | null)[]): PaintedCluster[] {
  const out: PaintedCluster[] = [];
  targets.forEach((t, k) => {
    const f = fits[k];
    if (f == null) return;
    const thetaRad = f.thetaArcmin * RAD_PER_ARCMIN;
    t.seds.forEach((sed, c) => {
      out.push({ px: t.px, py: t.py, thetaRad, bandAmplitudes: sed.map((a) => a * (f.amplitudes[c] as number)), shared: { sed, amplitude: f.amplitudes[c] as number } });
    });
  });
  return out;
}

/**
 * Measure y0, Y5R500 and their errors for every catalogue cluster (see module doc). A cluster off
 * the map, on a masked area or too near the edge is flagged and gets NaNs; the others go on.
 */
export function measureClusters(stack: BandStack, clusters: readonly CatalogueCluster[], opts: MeasureOptions): MeasureResult {
  const prep = prepareStack(stack, { apodisationArcmin: opts.apodisationArcmin });
  const targets = resolveTargets(stack, prep, clusters, opts);
  const scanSizes = opts.scanSizesArcmin ?? DEFAULT_SCAN_SIZES_ARCMIN;
  for (const s of scanSizes) if (!(s > 0)) throw new UmbraError("BAD_OPTION", `scan size ${s} arcmin must be > 0`, { field: "scanSizesArcmin" });
  let thetaMax = Math.max(...scanSizes);
  for (const t of targets) if (t.thetaArcmin !== null && Number.isFinite(t.thetaArcmin)) thetaMax = Math.max(thetaMax, t.thetaArcmin);
  let ellMax = 0;
  for (const l of prep.ells) if (l > ellMax) ellMax = l;
  const table = tabulateProfile(opts.profile, ellMax * thetaMax * RAD_PER_ARCMIN * 1.01 + 1);
  const beams = stack.bands.map((b) => b.beam);
  const names = stack.bands.map((b) => b.name);
  const covFrom = (spectra: readonly Float64Array[]): BandCovariance =>
    estimateBandCovariance(deconvolveBeams(spectra, beams, prep.ells), prep.plan.layout, stack.geometry, prep.ells, { windowMeanSquare: prep.windowMeanSquare, bandNames: names, beams, ...opts.covarianceOptions });
  const bankFor = (cov: BandCovariance, spectra: readonly Float64Array[] = prep.spectra): FilterBank =>
    buildFilterBank({ layout: prep.plan.layout, geometry: stack.geometry, ells: prep.ells, spectra, beams, covariance: cov, deproject: opts.deproject });
  let cov = opts.noiseCovariance ?? covFrom(prep.spectra);
  let bank = bankFor(cov);
  const runner = opts.fitRunner ?? serialFits;
  let fits = fitAll(bank, table, targets, scanSizes, runner, opts.onProgress);
  // Each iteration: subtract every cluster's current model, re-estimate the covariance from the
  // cleaned maps (Zubeldia et al. 2023), and update every cluster by a fit on the residual:
  // a ← a + fit(data − Σ models). The update is one Jacobi step of the joint least-squares fit of
  // all clusters, so neighbours stop biasing each other through the compensated filter's negative
  // ring (fitting one cluster's own template returns its amplitude exactly). Errors stay the
  // single-cluster ones, 1/Φ_cc (a slight underestimate for heavy blends). Sizes stay as chosen.
  const maxIt = opts.maxIterations ?? 4;
  const tol = opts.tolerance ?? 0.02;
  let iterations = 0;
  let lastChange = NaN;
  let cleaned: Float64Array[] = [];
  for (let it = 0; it < maxIt; it++) {
    cleaned = runner.paint(bank, table, prep.spectra, painted(targets, fits), -1);
    if (opts.noiseCovariance === undefined) {
      cov = covFrom(cleaned);
      bank = bankFor(cov);
    }
    const resid = rewhitenBank(bank, cleaned);
    const live = fits.flatMap((f, k) => (f === null ? [] : [k]));
    opts.onProgress?.(`cleaning ${it + 1}`, 0, 1);
    const updates = runner.fitMany(resid, table, live.map((k) => {
      const t = targets[k] as Target;
      return { seds: t.seds, sedKey: t.sedKey, thetaRad: (fits[k] as TargetFit).thetaArcmin * RAD_PER_ARCMIN, px: t.px, py: t.py };
    }));
    opts.onProgress?.(`cleaning ${it + 1}`, 1, 1);
    lastChange = 0;
    const next = [...fits];
    live.forEach((k, q) => {
      const f = fits[k] as TargetFit;
      const d = updates[q];
      if (d == null) return; // a singular update (should not happen once the first fit worked): keep the fit
      const amplitudes = f.amplitudes.map((a, c) => a + (d.amplitudes[c] as number));
      const change = Math.abs(d.amplitudes[0] as number) / Math.sqrt(d.covariance[0] as number);
      if (!isFatal((targets[k] as Target).flags) && change > lastChange) lastChange = change;
      next[k] = { ...f, amplitudes, covariance: d.covariance };
    });
    fits = next;
    iterations = it + 1;
    if (lastChange < tol) break;
  }
  if (maxIt > 0) cleaned = runner.paint(bank, table, prep.spectra, painted(targets, fits), -1);
  // bright point sources (radio: positive in bands below 200 GHz) near a cluster: flag it
  const sources: PointSource[] = [];
  const psSnr = opts.pointSourceSnr ?? 5;
  if (psSnr > 0) {
    const pixArcmin = Math.sqrt(stack.geometry.dxRad * stack.geometry.dyRad) / RAD_PER_ARCMIN;
    const cleanedNow = maxIt > 0 ? cleaned : prep.spectra;
    stack.bands.forEach((b, i) => {
      if (bandFrequencyGHz(b.spectral) >= 200) return;
      const found = detectPointSources(prep.plan, prep.ells, cleanedNow[i] as Float64Array, b.beam(prep.ells), cov, i, stack.geometry.dxRad * stack.geometry.dyRad, psSnr, null);
      sources.push(...found);
      targets.forEach((t) => {
        const r = Math.max(t.thetaArcmin ?? 2, b.beamFwhmArcmin) / pixArcmin;
        if (found.some((s) => (s.px - t.px) ** 2 + (s.py - t.py) ** 2 <= r * r) && !t.flags.includes("point_source")) t.flags.push("point_source");
      });
    });
  }
  // inhomogeneous depth: scale each cluster's covariance by the local white-noise level (ivar maps)
  if (stack.bands.some((b) => b.ivar !== null)) {
    const model = whiteNoiseModel(stack.bands.map((b) => b.ivar), prep.window);
    fits = fits.map((f, k) => {
      if (f === null) return null;
      const t = targets[k] as Target;
      const sigma = Math.sqrt(f.covariance[0] as number);
      const shares = whiteNoiseShares(bank, table, f.thetaArcmin * RAD_PER_ARCMIN, t.seds[0] as Float64Array, sigma, model.meanVariance);
      const p = Math.min(stack.ny - 1, Math.max(0, Math.round(t.py))) * stack.nx + Math.min(stack.nx - 1, Math.max(0, Math.round(t.px)));
      const r = localSigmaFactor(shares, sigma, model, p);
      return { ...f, covariance: f.covariance.map((c) => c * r * r) };
    });
  }
  // random positions on the cluster-subtracted maps, so that no catalogued cluster's wings enter
  const randoms = (opts.randomCount ?? 300) > 0 ? randomErrors(prep, maxIt > 0 ? rewhitenBank(bank, cleaned) : bank, table, targets, fits, opts) : [];
  // masses: every reportable cluster with a redshift, solved together (see ./masses.ts)
  const canMass = opts.physics !== undefined && opts.physics.angularDiameterDistanceMpc !== undefined && (opts.physics.massFromYSteps !== undefined || opts.physics.massFromY !== undefined);
  const massTargets = targets.map((t, k) => {
    const f = fits[k];
    const z = t.c.z;
    if (!canMass || isFatal(t.flags) || f == null || z == null || !(z > 0) || !((f.amplitudes[0] as number) > 0)) return null;
    return { seds: t.seds, sedKey: t.sedKey, px: t.px, py: t.py, z };
  });
  opts.onProgress?.("masses", 0, 1);
  const masses = opts.physics === undefined ? targets.map(() => null) : massesFromY(bank, table, massTargets, opts.physics, runner);
  opts.onProgress?.("masses", 1, 1);
  const results = targets.map((t, k) => toMeasurement(t, isFatal(t.flags) ? null : (fits[k] ?? null), table, randoms, opts, masses[k] ?? null));
  return {
    clusters: results,
    diagnostics: {
      iterations,
      lastChangeSigma: lastChange,
      maxConditionNumber: Math.max(...cov.conditionNumbers),
      loadedBins: cov.loading.filter((x) => x > 0).length,
      randomScatter: randoms.map((r) => ({ thetaArcmin: r.thetaRad / RAD_PER_ARCMIN, sigmaAnalytic: r.sigmaAnalytic, sigmaRandom: r.sigmaRandom, count: r.count })),
      covarianceSource: opts.noiseCovariance === undefined ? "data" : "simulations",
      pointSources: sources.length,
      filterProfile: medianFilterProfile(bank, table, targets, opts),
    },
  };
}

/** The filter's radial profile per band at the median catalogue size (non-relativistic tSZ SED), for plots. */
function medianFilterProfile(bank: FilterBank, table: ProfileTable, targets: readonly Target[], opts: MeasureOptions): FilterRadialProfile | null {
  const sizes = targets.flatMap((t) => (t.thetaArcmin !== null && t.thetaArcmin > 0 ? [t.thetaArcmin] : [])).sort((a, b) => a - b);
  if (sizes.length === 0) return null;
  const theta = sizes[Math.floor(sizes.length / 2)] as number;
  return filterRadialProfile(bank, table, theta * RAD_PER_ARCMIN, opts.seds.tsz(0));
}

function randomErrors(prep: PreparedStack, bank: FilterBank, table: ProfileTable, targets: readonly Target[], fits: readonly (TargetFit | null)[], opts: MeasureOptions): RandomScatter[] {
  const count = opts.randomCount ?? 300;
  if (count <= 0) return [];
  const thetas = fits.filter((f, k): f is TargetFit => f !== null && !isFatal(targets[k]!.flags)).map((f) => f.thetaArcmin);
  if (thetas.length === 0) return [];
  const lo = Math.min(...thetas);
  const hi = Math.max(...thetas);
  const n = hi > lo * 1.01 ? 6 : 1;
  const grid = Array.from({ length: n }, (_, i) => (n === 1 ? lo : lo * Math.pow(hi / lo, i / (n - 1))) * RAD_PER_ARCMIN);
  const { nx, ny, geometry } = prep.stack;
  const pixArcmin = Math.sqrt(geometry.dxRad * geometry.dyRad) / RAD_PER_ARCMIN;
  const allowed = randomAllowedMask(nx, ny, prep.window, prep.inpainted, targets, (opts.exclusionArcmin ?? 10) / pixArcmin);
  const filter = prepareSedFilter(bank, opts.seds.tsz(0));
  return randomPositionScatter(bank, prep.plan, table, filter, grid, allowed, count, createRng(opts.seed ?? 1).fork("random-positions"));
}

/** σ_random at θ: log-log interpolation of the random-position grid, scaled by the cluster's own analytic/grid-analytic ratio. */
function randomSigmaAt(randoms: readonly RandomScatter[], thetaRad: number): { ratio: number } {
  if (randoms.length === 0) return { ratio: NaN };
  const r = randoms.map((x) => x.sigmaRandom / x.sigmaAnalytic);
  if (randoms.length === 1) return { ratio: r[0] as number };
  const lt = Math.log(thetaRad);
  const ls = randoms.map((x) => Math.log(x.thetaRad));
  let k = 0;
  while (k < ls.length - 2 && lt > (ls[k + 1] as number)) k++;
  const t = Math.min(1, Math.max(0, (lt - (ls[k] as number)) / ((ls[k + 1] as number) - (ls[k] as number))));
  return { ratio: (r[k] as number) * (1 - t) + (r[k + 1] as number) * t };
}

function toMeasurement(
  t: Target,
  f: TargetFit | null,
  table: ProfileTable,
  randoms: readonly RandomScatter[],
  opts: MeasureOptions,
  mass: MassOutcome | null,
): ClusterMeasurement {
  const flags = [...t.flags];
  const base = { id: t.c.id, raDeg: t.c.raDeg, decDeg: t.c.decDeg, px: t.px, py: t.py, teKeVUsed: t.teKeV };
  if (f === null) {
    if (!isFatal(flags)) flags.push("fit_failed");
    return {
      ...base, theta500Arcmin: t.thetaArcmin ?? NaN, thetaSource: t.thetaArcmin === null ? "none" : t.thetaSource,
      y0: NaN, y0Err: NaN, yArcmin2: NaN, yErrArcmin2: NaN, snr: NaN, y0ErrRandom: NaN,
      vLosKms: NaN, vLosErrKms: NaN, yMpc2: NaN, yErrMpc2: NaN, m500Msun: NaN, m500ErrMsun: NaN, flags, scan: null,
    };
  }
  const y0 = f.amplitudes[0] as number;
  const y0Err = Math.sqrt(f.covariance[0] as number);
  const area = yOverY0Arcmin2(table, f.thetaArcmin);
  const yArcmin2 = y0 * area;
  const yErrArcmin2 = y0Err * area;
  if (f.scan !== null) {
    const th = f.scan.map((s) => s.theta500Arcmin);
    if (f.thetaArcmin === th[0] || f.thetaArcmin === th[th.length - 1]) flags.push("scan_edge");
  }
  let vLosKms = NaN;
  let vLosErrKms = NaN;
  if (opts.fitKsz === true) {
    if (t.knownTeKeV > 0) {
      // a_k = τ_e0 v/c with τ_e0 = y0 m_e c²/kTe (isothermal: y = (kTe/m_e c²) τ); linearised errors
      const a = f.amplitudes[1] as number;
      const dvda = (C_KMS * t.knownTeKeV) / (ELECTRON_REST_ENERGY_KEV * y0);
      vLosKms = a * dvda;
      const dvdy = -vLosKms / y0;
      const nc = 2;
      const vyy = f.covariance[0] as number;
      const vaa = f.covariance[nc + 1] as number;
      const vya = f.covariance[1] as number;
      vLosErrKms = Math.sqrt(dvda * dvda * vaa + dvdy * dvdy * vyy + 2 * dvda * dvdy * vya);
    } else flags.push("no_temperature");
  }
  let yMpc2 = NaN;
  let yErrMpc2 = NaN;
  let m500Msun = NaN;
  let m500ErrMsun = NaN;
  const z = t.c.z;
  if (z != null && z > 0 && opts.physics?.angularDiameterDistanceMpc !== undefined) {
    const da = opts.physics.angularDiameterDistanceMpc(z);
    const mpc2PerArcmin2 = (da * RAD_PER_ARCMIN) ** 2;
    yMpc2 = yArcmin2 * mpc2PerArcmin2;
    yErrMpc2 = yErrArcmin2 * mpc2PerArcmin2;
    if (mass === "failed") flags.push("mass_failed");
    else if (mass !== null) {
      m500Msun = mass.m500Msun;
      m500ErrMsun = mass.m500ErrMsun;
    }
  }
  const { ratio } = randomSigmaAt(randoms, f.thetaArcmin * RAD_PER_ARCMIN);
  return {
    ...base, theta500Arcmin: f.thetaArcmin, thetaSource: t.thetaSource,
    y0, y0Err, yArcmin2, yErrArcmin2, snr: y0 / y0Err, y0ErrRandom: ratio * y0Err,
    vLosKms, vLosErrKms, yMpc2, yErrMpc2, m500Msun, m500ErrMsun, flags, scan: f.scan,
  };
}

/** Nominal frequency of a band: its delta frequency, or the bandpass reference / mean frequency. */
function bandFrequencyGHz(b: BandStack["bands"][number]["spectral"]): number {
  if ("frequencyGHz" in b) return b.frequencyGHz;
  const bp = b.bandpass;
  if (bp.refFrequencyGHz !== undefined) return bp.refFrequencyGHz;
  let s = 0;
  let w = 0;
  for (let k = 0; k < bp.frequencyGHz.length; k++) {
    s += (bp.frequencyGHz[k] as number) * (bp.weight[k] as number);
    w += bp.weight[k] as number;
  }
  return w > 0 ? s / w : NaN;
}
