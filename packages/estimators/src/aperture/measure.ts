/**
 * Forced photometry on a Compton-y map (`umbra measure --method ilc`): build the y map of the band
 * stack with the ILC family (../ilc), then at every catalogue position take the aperture
 * photometry Y_ap (disc of radius R = k·θ500, default 1.5 θ500, minus a background annulus [1.5R, 2R]) and convert it to the
 * profile's amplitude by the aperture's response to the beam-convolved profile:
 *   y0 = Y_ap / Y_ap[τ ⊗ B_eff; y0 = 1],   Y5R500 = y0 · θ500² · g(0)
 * (g, the profile's Fourier transform at unit scale, from ../mmf/profile.ts; Y5R500/y0 = θ500² g(0)
 * for a shape truncated at 5 θ500). This is a one-parameter profile fit to the aperture flux; y0
 * is therefore model-dependent in the same way as the matched filter's. Errors: a first-pass fit of
 * every measured cluster (y0 × its beam-convolved template, aperture/model.ts) is subtracted from
 * the y map, the noise power is measured on that residual with a disc cut out around each cluster
 * (ilc/ypower.ts: cluster signal must not count as noise), and the aperture variance follows from
 * it (aperture/radial.ts); beside it, the empirical error is the scatter of random apertures on the residual away from
 * the clusters. Response and variance are computed on a small periodic grid around the aperture
 * (aperture/model.ts), checked in the tests against the full-map aperture.
 *
 * Crowding: a neighbour's profile wings (an A10 profile reaches 5 θ500) fall into a cluster's disc
 * and annulus, so the amplitudes are deblended by a few Jacobi sweeps,
 * y0_i ← y0_i + Y_ap,i(y − Σ_j y0_j T_j)/response_i (a joint linear fit of all templates, solved
 * iteratively; common practice, no source). The y map is rebuilt with the ILC covariance taken from
 * the bands minus the fitted clusters (ilc/ymap.ts covarianceMaps).
 *
 * The y map has one tSZ SED: a catalogue electron temperature is not used on this path
 * (teKeVUsed = 0; the matched filter handles the relativistic response per cluster).
 */
import { RAD_PER_ARCMIN, UmbraError, createRng, isUmbraError } from "@umbra/core";
import { convolveMap, worldToPixel } from "@umbra/maps";
import { tabulateProfile, type ProfileShape } from "../mmf/profile.js";
import type { ClusterFlag } from "../photometry/flags.js";
import type { CatalogueCluster, ClusterMeasurement, ClusterPhysics } from "../photometry/types.js";
import type { BandStack } from "../stack/types.js";
import { buildYMap, type YMapOptions, type YMapProduct } from "../ilc/ymap.js";
import { ilcBandsFromStack } from "../ilc/stack.js";
import { yMapNoisePower } from "../ilc/ypower.js";
import { apertureSum, type ApertureSpec } from "./photometry.js";
import { interpolatePower } from "./variance.js";
import { apertureModel, paintTemplate, responseAt, type ApertureModel } from "./model.js";
import { apertureVarianceRadial } from "./radial.js";
import { randomApertureScatter } from "./random.js";

/** Options of {@link measureCatalogByIlc}. */
export interface IlcMeasureOptions {
  /** Profile shape with θ500 as its scale (the same one the matched filter uses). */
  readonly profile: ProfileShape;
  readonly physics?: ClusterPhysics;
  /** How the y map is built (default: scale-dependent ILC, no deprojection). */
  readonly ymap?: YMapOptions;
  /** Deblending sweeps (default 3; 0 = none): see the module doc. */
  readonly deblendIterations?: number;
  /** Rebuilds of the y map with the fitted clusters subtracted from the covariance maps (default 1; 0 = none). */
  readonly iterations?: number;
  /** A y map already built from this stack (skips building and iterating). */
  readonly product?: YMapProduct;
  /** Disc radius in units of θ500 (default 1.5), at least the effective FWHM. */
  readonly radiusPerTheta500?: number;
  /** Annulus inner and outer radii in units of the disc radius (default 1.5 and 2). */
  readonly annulusInner?: number;
  readonly annulusOuter?: number;
  /** Random apertures per distinct aperture size for the empirical error (default 200; 0 = none). */
  readonly randomCount?: number;
  readonly seed?: number;
  /** Radius cut out around each catalogued cluster (after subtracting its fit) for the noise power and random apertures, in units of its disc radius (default 1). */
  readonly holeFactor?: number;
}

/** Result of {@link measureCatalogByIlc}. */
export interface IlcMeasureResult {
  readonly clusters: ClusterMeasurement[];
  readonly ymap: YMapProduct;
}

const FATAL: readonly ClusterFlag[] = ["off_map", "masked", "edge", "no_size"];

function emptyMeasurement(c: CatalogueCluster, px: number, py: number, theta: number, source: ClusterMeasurement["thetaSource"], flags: ClusterFlag[]): ClusterMeasurement {
  return {
    id: c.id,
    raDeg: c.raDeg,
    decDeg: c.decDeg,
    px,
    py,
    theta500Arcmin: theta,
    thetaSource: source,
    y0: NaN,
    y0Err: NaN,
    yArcmin2: NaN,
    yErrArcmin2: NaN,
    snr: NaN,
    y0ErrRandom: NaN,
    teKeVUsed: 0,
    vLosKms: NaN,
    vLosErrKms: NaN,
    yMpc2: NaN,
    yErrMpc2: NaN,
    m500Msun: NaN,
    m500ErrMsun: NaN,
    flags,
    scan: null,
  };
}

/**
 * Measure every catalogue cluster on the ILC y map of `stack` (see module doc). Rows with no usable
 * position or size get flags and NaNs; the batch goes on. θ500 comes from the catalogue, else from
 * M500 and z through `physics`, else the row is flagged `no_size` (this path does not scan sizes).
 * @throws UmbraError only for problems of the whole run (bad stack, bad options).
 */
export function measureCatalogByIlc(stack: BandStack, rows: readonly CatalogueCluster[], options: IlcMeasureOptions): IlcMeasureResult {
  const geom = stack.geometry;
  const bands = ilcBandsFromStack(stack);
  let product = options.product ?? buildYMap(bands, geom, options.ymap ?? {});
  const kR = options.radiusPerTheta500 ?? 1.5;
  const kIn = options.annulusInner ?? 1.5;
  const kOut = options.annulusOuter ?? 2;
  if (!(kR > 0) || !(kIn >= 1) || !(kOut > kIn)) {
    throw new UmbraError("BAD_OPTION", `aperture factors need radius > 0 and 1 ≤ inner < outer, got ${kR}, ${kIn}, ${kOut}`, { field: "aperture" });
  }
  const eff = product.effectiveFwhmArcmin;
  const specFor = (theta: number): ApertureSpec => {
    const r = Math.max(kR * theta, eff);
    return { radiusArcmin: r, annulusInnerArcmin: kIn * r, annulusOuterArcmin: kOut * r };
  };
  const targets = rows.map((c) => {
    const pos = stack.wcs === null ? { ix: NaN, iy: NaN } : worldToPixel(stack.wcs, c.raDeg, c.decDeg);
    let theta = c.theta500Arcmin ?? NaN;
    let source: ClusterMeasurement["thetaSource"] = "catalog";
    if (!(theta > 0)) {
      const m = c.m500Msun ?? NaN;
      const z = c.z ?? NaN;
      if (m > 0 && z > 0 && options.physics?.theta500ArcminFromMass) {
        theta = options.physics.theta500ArcminFromMass(m, z);
        source = "mass";
      } else {
        theta = NaN;
        source = "none";
      }
    }
    return { c, px: pos.ix, py: pos.iy, theta, source, spec: specFor(theta) };
  });
  const maxThetaArcmin = Math.max(10, ...targets.filter((t) => Number.isFinite(t.theta)).map((t) => 3 * t.theta));
  const ellCorner = Math.PI * Math.hypot(1 / geom.dxRad, 1 / geom.dyRad);
  const table = tabulateProfile(options.profile, 1.01 * ellCorner * maxThetaArcmin * RAD_PER_ARCMIN);
  const models = new Map<string, ApertureModel>();
  const modelFor = (theta: number): ApertureModel => {
    const key = theta.toFixed(4);
    let m = models.get(key);
    if (m === undefined) {
      m = apertureModel(specFor(theta), theta, table, eff, geom);
      models.set(key, m);
    }
    return m;
  };
  const responses = new Map<object, number>();
  /** The target's own aperture response at its sub-pixel position (arcmin² per unit y0). */
  const respFor = (t: { px: number; py: number; theta: number }): number => {
    let v = responses.get(t);
    if (v === undefined) {
      v = responseAt(modelFor(t.theta), geom, t.px - Math.round(t.px), t.py - Math.round(t.py));
      responses.set(t, v);
    }
    return v;
  };
  // pass 1: flags, aperture sums and amplitudes (the amplitude does not depend on the noise)
  const fit = () =>
    targets.map((t) => {
      const flags: ClusterFlag[] = [];
      if (!Number.isFinite(t.px) || !Number.isFinite(t.py) || t.px < -0.5 || t.py < -0.5 || t.px > geom.nx - 0.5 || t.py > geom.ny - 0.5) flags.push("off_map");
      if (!Number.isFinite(t.theta)) flags.push("no_size");
      if (flags.some((f) => FATAL.includes(f))) return { t, flags, y0: NaN };
      const ap = apertureSum(product.y, geom, t.px, t.py, t.spec);
      for (const f of ap.flags) flags.push(f);
      if (flags.length > 0) return { t, flags, y0: NaN };
      return { t, flags, y0: ap.yArcmin2 / respFor(t) };
    });
  /** Fit, then deblend: y0_i += Y_ap(y − Σ_j y0_j T_j)/response_i, so neighbours' wings leave the apertures and annuli. */
  const fitAll = () => {
    const fitted = fit();
    for (let d = 0; d < deblendIterations; d++) {
      const resid = Float64Array.from(product.y);
      for (const r of fitted) if (Number.isFinite(r.y0)) paintTemplate(resid, geom, modelFor(r.t.theta), -r.y0, r.t.px, r.t.py);
      for (const r of fitted) {
        if (!Number.isFinite(r.y0)) continue;
        const ap = apertureSum(resid, geom, r.t.px, r.t.py, r.t.spec);
        if (ap.flags.length === 0) r.y0 += ap.yArcmin2 / respFor(r.t);
      }
    }
    return fitted;
  };
  const deblendIterations = options.deblendIterations ?? 3;
  let pass = fitAll();
  // Rebuild the y map with the ILC covariance taken from the bands minus the fitted clusters (their
  // signal in the covariance would make the ILC cancel part of them), then fit again.
  const iterations = options.product !== undefined ? 0 : (options.iterations ?? 1);
  for (let it = 0; it < iterations; it++) {
    const yTrue = new Float64Array(geom.nx * geom.ny);
    for (const r of pass) if (Number.isFinite(r.y0)) paintTemplate(yTrue, geom, modelFor(r.t.theta), r.y0, r.t.px, r.t.py, false);
    const tsz = product.constraints[0]?.response ?? [];
    const covarianceMaps = bands.map((b, i) => {
      const transfer = b.beamTransfer(product.ellPerMode).map((v) => v * (tsz[i] as number));
      const model = convolveMap(yTrue, transfer, geom);
      return b.map.map((v, p) => v - (model[p] as number));
    });
    product = buildYMap(bands, geom, { ...(options.ymap ?? {}), covarianceMaps });
    pass = fitAll();
  }
  // subtract the first-pass fit of every measured cluster, then measure the noise on the residual
  const residual = Float64Array.from(product.y);
  for (const r of pass) if (Number.isFinite(r.y0)) paintTemplate(residual, geom, modelFor(r.t.theta), -r.y0, r.t.px, r.t.py);
  const onMap = targets.filter((t) => Number.isFinite(t.px) && Number.isFinite(t.py));
  const holes = onMap.map((t) => ({ xPix: t.px, yPix: t.py, radiusArcmin: (options.holeFactor ?? 1) * (Number.isFinite(t.theta) ? t.spec.radiusArcmin : 2 * eff) }));
  const noise = yMapNoisePower(product, { positions: holes, holeRadiusArcmin: 2 * eff, map: residual });
  const power = interpolatePower(noise);
  const ellStep = 0.5 * ((noise.ellCenters[1] ?? 2 * (noise.ellCenters[0] ?? 100)) - (noise.ellCenters[0] ?? 0));
  /** Amplitude and errors from the aperture of size θ500 = theta at (px, py) on `map`. */
  const measureAt = (map: Float64Array, px: number, py: number, theta: number) => {
    const spec = specFor(theta);
    const ap = apertureSum(map, geom, px, py, spec);
    const model = modelFor(theta);
    const y0 = ap.yArcmin2 / model.responseArcmin2;
    const y0Err = Math.sqrt(apertureVarianceRadial(spec, power, ellCorner, ellStep)) / Math.abs(model.responseArcmin2);
    const yPerY0 = theta * theta * table.integralUnitScale; // Y5R500 in arcmin² per unit y0
    return { spec, model, y0, y0Err, yArcmin2: y0 * yPerY0, yErrArcmin2: y0Err * yPerY0 };
  };
  const randoms = new Map<string, number>();
  const rng = createRng(options.seed ?? 1);
  const randomCount = options.randomCount ?? 200;
  const out: ClusterMeasurement[] = [];
  for (const r of pass) {
    const t = r.t;
    if (!Number.isFinite(r.y0)) {
      out.push(emptyMeasurement(t.c, t.px, t.py, t.theta, t.source, r.flags));
      continue;
    }
    // the deblended amplitude; errors from the aperture's variance
    const m0 = measureAt(residual, t.px, t.py, t.theta);
    const yPerY0 = t.theta * t.theta * table.integralUnitScale;
    const resp = respFor(t);
    const y0Err = (m0.y0Err * Math.abs(m0.model.responseArcmin2)) / Math.abs(resp);
    const m = { ...m0, y0: r.y0, y0Err, yArcmin2: r.y0 * yPerY0, yErrArcmin2: y0Err * yPerY0 };
    const key = t.theta.toFixed(4);
    let randomStd = randoms.get(key);
    if (randomStd === undefined && randomCount >= 2) {
      const avoid = holes.map((h) => ({ xPix: h.xPix, yPix: h.yPix }));
      const avoidR = t.spec.radiusArcmin; // no cluster centre inside a random disc (their fits are subtracted)
      randomStd = randomApertureScatter(residual, geom, t.spec, rng.fork(key), { count: randomCount, avoid, avoidRadiusArcmin: avoidR }).stdArcmin2;
      randoms.set(key, randomStd);
    }
    let yMpc2 = NaN;
    let yErrMpc2 = NaN;
    let m500 = NaN;
    let m500Err = NaN;
    const z = t.c.z ?? NaN;
    if (z > 0 && options.physics?.angularDiameterDistanceMpc) {
      const perArcmin2 = (options.physics.angularDiameterDistanceMpc(z) * RAD_PER_ARCMIN) ** 2; // Mpc² per arcmin² at D_A
      yMpc2 = m.yArcmin2 * perArcmin2;
      yErrMpc2 = m.yErrArcmin2 * perArcmin2;
    }
    if (z > 0 && options.physics?.massFromY) {
      // other sizes: the aperture on the map with every other cluster's fit subtracted
      const own = Float64Array.from(residual);
      paintTemplate(own, geom, modelFor(t.theta), r.y0, t.px, t.py);
      try {
        const mass = options.physics.massFromY((theta) => {
          const a = measureAt(own, t.px, t.py, theta);
          return { yArcmin2: a.yArcmin2, yErrArcmin2: a.yErrArcmin2 };
        }, z);
        m500 = mass.m500Msun;
        m500Err = mass.m500ErrMsun;
      } catch (e) {
        // a size the relation tries may leave the map or give Y ≤ 0: no mass for this cluster, the batch goes on
        if (!isUmbraError(e)) throw e;
      }
    }
    out.push({
      ...emptyMeasurement(t.c, t.px, t.py, t.theta, t.source, r.flags),
      y0: m.y0,
      y0Err: m.y0Err,
      yArcmin2: m.yArcmin2,
      yErrArcmin2: m.yErrArcmin2,
      snr: m.y0 / m.y0Err,
      y0ErrRandom: randomStd === undefined ? NaN : randomStd / Math.abs(resp),
      yMpc2,
      yErrMpc2,
      m500Msun: m500,
      m500ErrMsun: m500Err,
    });
  }
  return { clusters: out, ymap: product };
}
