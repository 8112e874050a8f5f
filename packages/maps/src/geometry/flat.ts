/**
 * Flat-sky geometry of a map from its WCS: the pixel sides on the sky at the reference point.
 * Every projection umbra evaluates (TAN, SIN, CAR, ZEA, ARC, STG) has unit scale at its fiducial
 * point (Calabretta & Greisen 2002, A&A 395, 1077, §5: R_θ → 90° − θ as θ → 90°; CAR is
 * x = φ, y = θ at the equator), so there a step of one pixel along image axis j moves the sky
 * position by |column j of CD| degrees (Greisen & Calabretta 2002, A&A 395, 1061, eq. 3).
 */
import { UmbraError, RAD_PER_DEG } from "@umbra/core";
import type { FlatGeometry, SkyMap } from "../types.js";
import type { Wcs } from "../wcs/types.js";

/** Pixel sides of `wcs` at its reference point, in degrees: |CD column 1|, |CD column 2|. */
export function pixelSidesDeg(wcs: Wcs): { dxDeg: number; dyDeg: number } {
  const [a, b, c, d] = wcs.cd;
  return { dxDeg: Math.hypot(a, c), dyDeg: Math.hypot(b, d) };
}

/**
 * Flat-sky geometry of `map`: nx, ny and the pixel sides in radians at the WCS reference point
 * (see the module comment). The flat-sky approximation holds for fields of a few degrees.
 * @throws UmbraError BAD_WCS when the map has no WCS, or its pixel axes are not perpendicular on
 *   the sky (|cos angle| > 1e-6: a flat Fourier grid needs a rectangular pixel grid).
 */
export function flatGeometry(map: SkyMap): FlatGeometry {
  if (map.wcs === null) throw new UmbraError("BAD_WCS", "the map has no celestial WCS: its pixel size is unknown", { keyword: "CTYPE1" });
  const [a, b, c, d] = map.wcs.cd;
  const { dxDeg, dyDeg } = pixelSidesDeg(map.wcs);
  const cosAngle = (a * b + c * d) / (dxDeg * dyDeg);
  if (Math.abs(cosAngle) > 1e-6) {
    throw new UmbraError("BAD_WCS", `pixel axes are not perpendicular (cos angle = ${cosAngle.toExponential(3)}): reproject onto a rectangular grid first`, { keyword: "CD1_2" });
  }
  return { nx: map.nx, ny: map.ny, dxRad: dxDeg * RAD_PER_DEG, dyRad: dyDeg * RAD_PER_DEG };
}

/** Pixel sides in arcmin at the reference point (60 × |CD column j|). */
export function pixelSizeArcmin(wcs: Wcs): { dxArcmin: number; dyArcmin: number } {
  const { dxDeg, dyDeg } = pixelSidesDeg(wcs);
  return { dxArcmin: dxDeg * 60, dyArcmin: dyDeg * 60 };
}

/** Flat-sky extent of a geometry: width nx·dx and height ny·dy in degrees, and area in deg². */
export function fieldSizeDeg(geom: FlatGeometry): { widthDeg: number; heightDeg: number; areaDeg2: number } {
  const widthDeg = (geom.nx * geom.dxRad) / RAD_PER_DEG;
  const heightDeg = (geom.ny * geom.dyRad) / RAD_PER_DEG;
  return { widthDeg, heightDeg, areaDeg2: widthDeg * heightDeg };
}

/** Solid angle of one pixel in steradians, flat sky: dx·dy. */
export function pixelAreaSr(geom: FlatGeometry): number {
  return geom.dxRad * geom.dyRad;
}
