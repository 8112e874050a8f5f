/**
 * Aperture photometry on a Compton-y map: the integral of y over a disc of radius R minus the
 * disc's area times the mean y in a background annulus [R_in, R_out]:
 *   Y_ap = ΔΩ · Σ_{disc} (y_p − b),  b = mean_{annulus} y_p,
 * in arcmin² when ΔΩ (the pixel solid angle) is in arcmin² (common practice, no source). A pixel
 * belongs to a region when its centre does (flat-sky distances from the sub-pixel centre).
 */
import { ARCMIN2_PER_SR, RAD_PER_ARCMIN, UmbraError } from "@umbra/core";
import type { FlatGeometry } from "@umbra/maps";

/** Disc and background annulus radii, arcmin. */
export interface ApertureSpec {
  radiusArcmin: number;
  annulusInnerArcmin: number;
  annulusOuterArcmin: number;
}

/** Flags an aperture measurement can carry. */
export type ApertureFlag = "edge" | "masked";

/** One aperture measurement. */
export interface ApertureResult {
  /** Background-subtracted integral of y over the disc, arcmin² (NaN when flagged). */
  yArcmin2: number;
  /** Mean y in the annulus (dimensionless; NaN when flagged). */
  background: number;
  discPixels: number;
  annulusPixels: number;
  flags: ApertureFlag[];
}

/** Throw BAD_VALUE unless 0 < R ≤ R_in < R_out (all finite). */
export function checkApertureSpec(spec: ApertureSpec): void {
  const { radiusArcmin: r, annulusInnerArcmin: a, annulusOuterArcmin: b } = spec;
  if (!(r > 0) || !(a >= r) || !(b > a) || !Number.isFinite(b)) {
    throw new UmbraError("BAD_VALUE", `aperture needs 0 < radius ≤ annulus inner < annulus outer (arcmin), got ${r}, ${a}, ${b}`, {
      field: "aperture",
    });
  }
}

/** Pixel solid angle in arcmin². */
export function pixelAreaArcmin2(geom: FlatGeometry): number {
  return geom.dxRad * geom.dyRad * ARCMIN2_PER_SR;
}

/**
 * Aperture photometry at pixel position (xPix, yPix) (0-based, x along rows). Flags "edge" when the
 * annulus leaves the map, "masked" when a disc pixel is NaN or fewer than half the annulus pixels
 * are valid; flagged results carry NaN values.
 */
export function apertureSum(map: Float64Array, geom: FlatGeometry, xPix: number, yPix: number, spec: ApertureSpec): ApertureResult {
  checkApertureSpec(spec);
  const dxA = geom.dxRad / RAD_PER_ARCMIN;
  const dyA = geom.dyRad / RAD_PER_ARCMIN;
  const r2 = spec.radiusArcmin ** 2;
  const a2 = spec.annulusInnerArcmin ** 2;
  const b2 = spec.annulusOuterArcmin ** 2;
  const rx = spec.annulusOuterArcmin / dxA;
  const ry = spec.annulusOuterArcmin / dyA;
  const flags: ApertureFlag[] = [];
  if (!(xPix - rx >= -0.5 && xPix + rx <= geom.nx - 0.5 && yPix - ry >= -0.5 && yPix + ry <= geom.ny - 0.5)) {
    flags.push("edge");
    return { yArcmin2: NaN, background: NaN, discPixels: 0, annulusPixels: 0, flags };
  }
  const x0 = Math.max(0, Math.ceil(xPix - rx));
  const x1 = Math.min(geom.nx - 1, Math.floor(xPix + rx));
  const y0 = Math.max(0, Math.ceil(yPix - ry));
  const y1 = Math.min(geom.ny - 1, Math.floor(yPix + ry));
  let discSum = 0;
  let discN = 0;
  let discNan = 0;
  let annSum = 0;
  let annN = 0;
  let annAll = 0;
  for (let iy = y0; iy <= y1; iy++) {
    const dy = (iy - yPix) * dyA;
    const row = iy * geom.nx;
    for (let ix = x0; ix <= x1; ix++) {
      const dx = (ix - xPix) * dxA;
      const d2 = dx * dx + dy * dy;
      const v = map[row + ix] as number;
      if (d2 <= r2) {
        if (Number.isNaN(v)) discNan++;
        else {
          discSum += v;
          discN++;
        }
      }
      if (d2 >= a2 && d2 <= b2) {
        annAll++;
        if (!Number.isNaN(v)) {
          annSum += v;
          annN++;
        }
      }
    }
  }
  if (discNan > 0 || discN === 0 || annN === 0 || annN < 0.5 * annAll) {
    flags.push("masked");
    return { yArcmin2: NaN, background: NaN, discPixels: discN, annulusPixels: annN, flags };
  }
  const background = annSum / annN;
  return { yArcmin2: pixelAreaArcmin2(geom) * (discSum - discN * background), background, discPixels: discN, annulusPixels: annN, flags };
}
