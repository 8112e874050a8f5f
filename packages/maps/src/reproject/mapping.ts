/**
 * The pixel mapping a reprojection evaluates: a target pixel → its sky position in the target's
 * frame (target WCS) → the same position in the source's frame (a fixed rotation between ICRS,
 * FK5 J2000 and Galactic, ../wcs/frames.ts) → its pixel on the source grid (source WCS).
 */
import { frameOf, frameRotation, rotateLonLat, type Matrix3 } from "../wcs/frames.js";
import { pixelToWorldPlanned, planWcs, worldToPixelPlanned, type WcsPlan } from "../wcs/transform.js";
import type { Wcs } from "../wcs/types.js";

/** A prepared target → source pixel mapping (see {@link planPixelMapping}). */
export interface PixelMapping {
  source: WcsPlan;
  target: WcsPlan;
  /** Rotation from the target's frame to the source's, or null when the frames are the same. */
  rotation: Matrix3 | null;
}

/**
 * Prepare the mapping from pixels of a grid with WCS `target` to pixels of a grid with WCS
 * `source`, converting between their celestial frames when they differ.
 * @throws UmbraError BAD_WCS naming RADESYS when the frames cannot be converted (FK4, GAPPT, FK5 at
 *   an equinox other than 2000).
 */
export function planPixelMapping(source: Wcs, target: Wcs): PixelMapping {
  const from = frameOf(target);
  const to = frameOf(source);
  const same = from.radesys === to.radesys && from.equinox === to.equinox;
  return { source: planWcs(source), target: planWcs(target), rotation: same ? null : frameRotation(from, to) };
}

/**
 * Write into `out` the 0-based source pixel position [x, y] of the centre of 0-based target pixel
 * (ix, iy), NaN when the target pixel has no sky position (outside its projection's domain).
 * Allocates nothing.
 */
export function targetToSourcePixel(m: PixelMapping, ix: number, iy: number, out: Float64Array | number[]): void {
  pixelToWorldPlanned(m.target, ix, iy, out);
  const lon = out[0] as number;
  if (Number.isNaN(lon)) {
    out[1] = NaN;
    return;
  }
  if (m.rotation !== null) rotateLonLat(m.rotation, lon, out[1] as number, out);
  worldToPixelPlanned(m.source, out[0] as number, out[1] as number, out);
}
