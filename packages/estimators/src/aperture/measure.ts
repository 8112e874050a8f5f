/**
 * Forced photometry on a Compton-y map (`umbra measure --method ilc`): build the y map of the band
 * stack with the ILC family (../ilc), then at every catalogue position take the aperture
 * photometry Y_ap (disc of radius R = k·θ500 minus a background annulus) and convert it to the
 * profile's amplitude by the aperture's response to the beam-convolved profile:
 *   y0 = Y_ap / Y_ap[τ ⊗ B_eff; y0 = 1],   Y5R500 = y0 · θ500² · g(0)
 * (g, the profile's Fourier transform at unit scale, from ../mmf/profile.ts; Y5R500/y0 = θ500² g(0)
 * for a shape truncated at 5 θ500). This is a one-parameter profile fit to the aperture flux; y0
 * is therefore model-dependent in the same way as the matched filter's. Errors: a first-pass fit of
 * every measured cluster (y0 × its beam-convolved template, aperture/model.ts) is subtracted from
 * the y map, the noise power is measured on that residual with a disc cut out around each cluster
 * (ilc/ypower.ts: cluster signal must not count as noise), and the aperture variance follows from
 * it; beside it, the empirical error is the scatter of random apertures on the residual away from
 * the clusters. Response and variance are computed on a small periodic grid around the aperture
 * (aperture/model.ts), checked in the tests against the full-map aperture.
 *
 * The y map has one tSZ SED: a catalogue electron temperature is not used on this path
 * (teKeVUsed = 0; the matched filter handles the relativistic response per cluster).
 */
import { RAD_PER_ARCMIN, UmbraError, createRng } from "@umbra/core";
import { worldToPixel } from "@umbra/maps";
import { tabulateProfile, type ProfileShape } from "../mmf/profile.js";
import type { ClusterFlag } from "../photometry/flags.js";
import type { CatalogueCluster, ClusterMeasurement, ClusterPhysics } from "../photometry/types.js";
import type { BandStack } from "../stack/types.js";
import { buildYMap, type YMapOptions, type YMapProduct } from "../ilc/ymap.js";
import { ilcBandsFromStack } from "../ilc/stack.js";
import { yMapNoisePower } from "../ilc/ypower.js";
import { apertureSum, type ApertureSpec } from "./photometry.js";
import { interpolatePower } from "./variance.js";
import { apertureModel, paintTemplate, type ApertureModel } from "./model.js";
import { randomApertureScatter } from "./random.js";

/** Options of {@link measureCatalogByIlc}. */
export interface IlcMeasureOptions {
  /** Profile shape with θ500 as its scale (the same one the matched filter uses). */
  readonly profile: ProfileShape;
  readonly physics?: ClusterPhysics;
  /** How the y map is built (default: scale-dependent ILC, no deprojection). */
  readonly ymap?: YMapOptions;
  /** A y map already built from this stack (skips building). */
  readonly product?: YMapProduct;
  /** Disc radius in units of θ500 (default 2), at least the effective FWHM. */
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
  const product = options.product ?? buildYMap(ilcBandsFromStack(stack), geom, options.ymap ?? {});
  const kR = options.radiusPerTheta500 ?? 2;
  const kIn = options.annulusInner ?? 1.5;
  const kOut = options.annulusOuter ?? 2;
  if (!(kR > 0) || !(kIn >= 1) || !(kOut > kIn)) {
    throw new UmbraError("BAD_OPTION", `aperture factors need radius > 0 and 1 ≤ inner < outer, got ${kR}, ${kIn}, ${kOut}`, { field: "aperture" });
  }
  const eff = product.effectiveFwhmArcmin;
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
    const r = Math.max(kR * theta, eff);
    const spec: ApertureSpec = { radiusArcmin: r, annulusInnerArcmin: kIn * r, annulusOuterArcmin: kOut * r };
    return { c, px: pos.ix, py: pos.iy, theta, source, spec };
  });
  const maxThetaArcmin = Math.max(1e-3, ...targets.filter((t) => Number.isFinite(t.theta)).map((t) => t.theta));
  const ellCorner = Math.PI * Math.hypot(1 / geom.dxRad, 1 / geom.dyRad);
  const table = tabulateProfile(options.profile, 1.01 * ellCorner * maxThetaArcmin * RAD_PER_ARCMIN);
  const models = new Map<string, ApertureModel>();
  const modelFor = (theta: number, spec: ApertureSpec, power: (ell: number) => number): ApertureModel => {
    const key = theta.toFixed(4);
    let m = models.get(key);
    if (m === undefined) {
      m = apertureModel(spec, theta, table, eff, geom, power);
      models.set(key, m);
    }
    return m;
  };
  // pass 1: flags, aperture sums and amplitudes (the amplitude does not depend on the noise)
  const zeroPower = (): number => 0;
  const pass = targets.map((t) => {
    const flags: ClusterFlag[] = [];
    if (!Number.isFinite(t.px) || !Number.isFinite(t.py) || t.px < -0.5 || t.py < -0.5 || t.px > geom.nx - 0.5 || t.py > geom.ny - 0.5) flags.push("off_map");
    if (!Number.isFinite(t.theta)) flags.push("no_size");
    if (flags.some((f) => FATAL.includes(f))) return { t, flags, y0: NaN };
    const ap = apertureSum(product.y, geom, t.px, t.py, t.spec);
    for (const f of ap.flags) flags.push(f);
    if (flags.length > 0) return { t, flags, y0: NaN };
    return { t, flags, y0: ap.yArcmin2 / modelFor(t.theta, t.spec, zeroPower).responseArcmin2 };
  });
  // subtract the first-pass fit of every measured cluster, then measure the noise on the residual
  const residual = Float64Array.from(product.y);
  for (const r of pass) if (Number.isFinite(r.y0)) paintTemplate(residual, geom, modelFor(r.t.theta, r.t.spec, zeroPower), -r.y0, r.t.px, r.t.py);
  const onMap = targets.filter((t) => Number.isFinite(t.px) && Number.isFinite(t.py));
  const holes = onMap.map((t) => ({ xPix: t.px, yPix: t.py, radiusArcmin: (options.holeFactor ?? 1) * (Number.isFinite(t.theta) ? t.spec.radiusArcmin : 2 * eff) }));
  const power = interpolatePower(yMapNoisePower(product, { positions: holes, holeRadiusArcmin: 2 * eff, map: residual }));
  models.clear();
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
    const model = modelFor(t.theta, t.spec, power);
    const key = t.theta.toFixed(4);
    let randomStd = randoms.get(key);
    if (randomStd === undefined && randomCount >= 2) {
      const avoid = holes.map((h) => ({ xPix: h.xPix, yPix: h.yPix }));
      const avoidR = t.spec.radiusArcmin + Math.max(...holes.map((h) => h.radiusArcmin), 0);
      randomStd = randomApertureScatter(residual, geom, t.spec, rng.fork(key), { count: randomCount, avoid, avoidRadiusArcmin: avoidR }).stdArcmin2;
      randoms.set(key, randomStd);
    }
    const y0 = r.y0;
    const y0Err = Math.sqrt(model.varianceArcmin4) / Math.abs(model.responseArcmin2);
    const yPerY0 = t.theta * t.theta * table.integralUnitScale; // arcmin² per unit y0
    const yArcmin2 = y0 * yPerY0;
    const yErrArcmin2 = y0Err * yPerY0;
    let yMpc2 = NaN;
    let yErrMpc2 = NaN;
    let m500 = NaN;
    let m500Err = NaN;
    const z = t.c.z ?? NaN;
    if (z > 0 && options.physics?.angularDiameterDistanceMpc) {
      const da = options.physics.angularDiameterDistanceMpc(z);
      const perArcmin2 = (da * RAD_PER_ARCMIN) ** 2; // Mpc² per arcmin² at D_A
      yMpc2 = yArcmin2 * perArcmin2;
      yErrMpc2 = yErrArcmin2 * perArcmin2;
      if (options.physics.massFromY) {
        const m = options.physics.massFromY(yMpc2, yErrMpc2, z);
        m500 = m.m500Msun;
        m500Err = m.m500ErrMsun;
      }
    }
    out.push({
      ...emptyMeasurement(t.c, t.px, t.py, t.theta, t.source, r.flags),
      y0,
      y0Err,
      yArcmin2,
      yErrArcmin2,
      snr: y0 / y0Err,
      y0ErrRandom: randomStd === undefined ? NaN : randomStd / Math.abs(model.responseArcmin2),
      yMpc2,
      yErrMpc2,
      m500Msun: m500,
      m500ErrMsun: m500Err,
    });
  }
  return { clusters: out, ymap: product };
}
