/**
 * The empirical error of aperture photometry: the scatter of the same estimator at random
 * positions away from known clusters and from the map's edges (common practice, no source).
 */
import type { Rng } from "@umbra/core";
import { RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import type { FlatGeometry } from "@umbra/maps";
import { apertureSum, checkApertureSpec, type ApertureSpec } from "./photometry.js";

/** Options of {@link randomApertureScatter}. */
export interface RandomApertureOptions {
  /** Number of valid random apertures wanted (default 200). */
  count?: number;
  /** Pixel positions (0-based) to stay away from, e.g. catalogued clusters. */
  avoid?: readonly { xPix: number; yPix: number }[];
  /** Minimum distance from any avoided position, arcmin (default: twice the annulus outer radius). */
  avoidRadiusArcmin?: number;
}

/** Result of {@link randomApertureScatter}. */
export interface RandomApertureScatter {
  /** Sample standard deviation of Y_ap over the random apertures, arcmin² (NaN below 2 apertures). */
  stdArcmin2: number;
  /** Mean Y_ap, arcmin² (should be ≈ 0). */
  meanArcmin2: number;
  /** Number of apertures used. */
  count: number;
}

/**
 * Draw apertures at uniform random positions (rejecting flagged ones and those within
 * `avoidRadiusArcmin` of an avoided position) and return the scatter of Y_ap. Deterministic for a
 * given `rng` state. Gives up after 50× the wanted count of draws and returns what it has.
 */
export function randomApertureScatter(map: Float64Array, geom: FlatGeometry, spec: ApertureSpec, rng: Rng, options: RandomApertureOptions = {}): RandomApertureScatter {
  checkApertureSpec(spec);
  const want = options.count ?? 200;
  if (!Number.isInteger(want) || want < 2) throw new UmbraError("BAD_VALUE", `random aperture count ${want} must be an integer ≥ 2`, { field: "count" });
  const avoid = options.avoid ?? [];
  const avoidR = options.avoidRadiusArcmin ?? 2 * spec.annulusOuterArcmin;
  const dxA = geom.dxRad / RAD_PER_ARCMIN;
  const dyA = geom.dyRad / RAD_PER_ARCMIN;
  const values: number[] = [];
  for (let tries = 0; tries < 50 * want && values.length < want; tries++) {
    const x = rng.uniform() * geom.nx - 0.5;
    const y = rng.uniform() * geom.ny - 0.5;
    let near = false;
    for (const p of avoid) {
      if (((x - p.xPix) * dxA) ** 2 + ((y - p.yPix) * dyA) ** 2 < avoidR * avoidR) {
        near = true;
        break;
      }
    }
    if (near) continue;
    const r = apertureSum(map, geom, x, y, spec);
    if (r.flags.length === 0) values.push(r.yArcmin2);
  }
  const n = values.length;
  if (n < 2) return { stdArcmin2: NaN, meanArcmin2: n === 1 ? (values[0] as number) : NaN, count: n };
  const mean = values.reduce((s, v) => s + v, 0) / n;
  const variance = values.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1);
  return { stdArcmin2: Math.sqrt(variance), meanArcmin2: mean, count: n };
}
