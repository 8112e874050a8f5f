/**
 * Pixel ↔ world transforms of a celestial {@link Wcs} (Greisen & Calabretta 2002, A&A 395, 1061
 * eq. 3 for the linear part; Calabretta & Greisen 2002, A&A 395, 1077 for projection + rotation).
 *
 * Pixel indices are 0-based here: the FITS pixel coordinate is index + 1, so pixel index
 * (ix, iy) = (CRPIX1 − 1, CRPIX2 − 1) is the reference point. World coordinates are (longitude,
 * latitude) in degrees whatever the axis order in the header; longitudes come out in [0, 360).
 * Points outside a projection's domain give NaN.
 */
import { nativeToPlane, planeToNative, fiducialThetaDeg } from "./projections.js";
import type { ProjectionParams } from "./projections.js";
import { celestialToNative, makeRotation, nativePoleDeg, nativeToCelestial } from "./sphere.js";
import type { SphereRotation } from "./sphere.js";
import type { Wcs } from "./types.js";

/** A WCS with everything a pixel loop needs precomputed. */
export interface WcsPlan {
  readonly proj: ProjectionParams;
  readonly rot: SphereRotation;
  readonly lonAxis: 0 | 1;
  readonly crpix1: number;
  readonly crpix2: number;
  readonly cd: readonly [number, number, number, number];
  /** Inverse of the CD matrix, row-major. */
  readonly cdInv: readonly [number, number, number, number];
}

/** Precompute the rotation and inverse matrix of `wcs` for repeated transforms. */
export function planWcs(wcs: Wcs): WcsPlan {
  const lonIndex = wcs.lonAxis === 0 ? 1 : 2;
  const latIndex = 3 - lonIndex;
  const proj: ProjectionParams = {
    projection: wcs.projection,
    xi: wcs.projection === "SIN" ? (wcs.pv[`${latIndex}_1`] ?? 0) : 0,
    eta: wcs.projection === "SIN" ? (wcs.pv[`${latIndex}_2`] ?? 0) : 0,
  };
  const lng0 = wcs.crval[wcs.lonAxis];
  const lat0 = wcs.crval[1 - wcs.lonAxis];
  const pole = nativePoleDeg(lng0, lat0, 0, fiducialThetaDeg(wcs.projection), wcs.lonpole, wcs.latpole);
  const [a, b, c, d] = wcs.cd;
  const det = a * d - b * c;
  return {
    proj,
    rot: makeRotation(pole.alphaP, pole.deltaP, wcs.lonpole),
    lonAxis: wcs.lonAxis,
    crpix1: wcs.crpix[0],
    crpix2: wcs.crpix[1],
    cd: wcs.cd,
    cdInv: [d / det, -b / det, -c / det, a / det],
  };
}

/** Sky position in degrees. */
export interface WorldDeg {
  lonDeg: number;
  latDeg: number;
}

/** 0-based pixel position (may be fractional). */
export interface PixelPos {
  ix: number;
  iy: number;
}

/**
 * One pixel → world with a precomputed plan; writes (lonDeg, latDeg) into `out`.
 * Steps: intermediate world x = CD · (p − CRPIX) (Paper I eq. 3, p = index + 1), deprojection
 * (Paper II §5), rotation to celestial (Paper II eq. 2).
 */
export function pixelToWorldPlanned(plan: WcsPlan, ix: number, iy: number, out: Float64Array | number[]): void {
  const p = ix + 1 - plan.crpix1;
  const q = iy + 1 - plan.crpix2;
  const x1 = plan.cd[0] * p + plan.cd[1] * q;
  const x2 = plan.cd[2] * p + plan.cd[3] * q;
  const ok = plan.lonAxis === 0 ? planeToNative(plan.proj, x1, x2, out) : planeToNative(plan.proj, x2, x1, out);
  if (!ok) return;
  nativeToCelestial(plan.rot, out[0] as number, out[1] as number, out);
}

/** One world position → 0-based pixel with a precomputed plan; writes (ix, iy) into `out`. */
export function worldToPixelPlanned(plan: WcsPlan, lonDeg: number, latDeg: number, out: Float64Array | number[]): void {
  if (!(Math.abs(latDeg) <= 90)) {
    out[0] = NaN;
    out[1] = NaN;
    return;
  }
  celestialToNative(plan.rot, lonDeg, latDeg, out);
  if (!nativeToPlane(plan.proj, out[0] as number, out[1] as number, out)) return;
  const x1 = plan.lonAxis === 0 ? (out[0] as number) : (out[1] as number);
  const x2 = plan.lonAxis === 0 ? (out[1] as number) : (out[0] as number);
  out[0] = plan.cdInv[0] * x1 + plan.cdInv[1] * x2 + plan.crpix1 - 1;
  out[1] = plan.cdInv[2] * x1 + plan.cdInv[3] * x2 + plan.crpix2 - 1;
}

/**
 * World coordinates (degrees) of the 0-based pixel (ix, iy) (Greisen & Calabretta 2002 eq. 3;
 * Calabretta & Greisen 2002 §5 and eq. 2). Longitude in [0, 360); NaN outside the projection.
 * For many pixels use {@link pixelToWorldArray}.
 */
export function pixelToWorld(wcs: Wcs, ix: number, iy: number): WorldDeg {
  const out = [0, 0];
  pixelToWorldPlanned(planWcs(wcs), ix, iy, out);
  return { lonDeg: out[0] as number, latDeg: out[1] as number };
}

/**
 * 0-based pixel position of the sky position (lonDeg, latDeg) (inverse of {@link pixelToWorld};
 * Calabretta & Greisen 2002 eq. 5 and §5). NaN when the point cannot be projected (e.g. behind
 * the tangent plane of TAN or the limb of SIN).
 */
export function worldToPixel(wcs: Wcs, lonDeg: number, latDeg: number): PixelPos {
  const out = [0, 0];
  worldToPixelPlanned(planWcs(wcs), lonDeg, latDeg, out);
  return { ix: out[0] as number, iy: out[1] as number };
}

/**
 * Array form of {@link pixelToWorld}: world coordinates (degrees) of pixels `ix[k]`, `iy[k]`
 * (0-based), written into `lonDeg`, `latDeg` (allocated when not given). Returns the outputs.
 */
export function pixelToWorldArray(
  wcs: Wcs,
  ix: ArrayLike<number>,
  iy: ArrayLike<number>,
  lonDeg: Float64Array = new Float64Array(ix.length),
  latDeg: Float64Array = new Float64Array(ix.length),
): { lonDeg: Float64Array; latDeg: Float64Array } {
  const plan = planWcs(wcs);
  const tmp = new Float64Array(2);
  for (let k = 0; k < ix.length; k++) {
    pixelToWorldPlanned(plan, ix[k] as number, iy[k] as number, tmp);
    lonDeg[k] = tmp[0] as number;
    latDeg[k] = tmp[1] as number;
  }
  return { lonDeg, latDeg };
}

/**
 * Array form of {@link worldToPixel}: 0-based pixel positions of sky positions `lonDeg[k]`,
 * `latDeg[k]` (degrees), written into `ix`, `iy` (allocated when not given). Returns the outputs.
 */
export function worldToPixelArray(
  wcs: Wcs,
  lonDeg: ArrayLike<number>,
  latDeg: ArrayLike<number>,
  ix: Float64Array = new Float64Array(lonDeg.length),
  iy: Float64Array = new Float64Array(lonDeg.length),
): { ix: Float64Array; iy: Float64Array } {
  const plan = planWcs(wcs);
  const tmp = new Float64Array(2);
  for (let k = 0; k < lonDeg.length; k++) {
    worldToPixelPlanned(plan, lonDeg[k] as number, latDeg[k] as number, tmp);
    ix[k] = tmp[0] as number;
    iy[k] = tmp[1] as number;
  }
  return { ix, iy };
}
