/** Cutting a small map around a sky position, with the WCS moved along (CRPIX shifted). */
import { UmbraError } from "@umbra/core";
import type { SkyMap } from "../types.js";
import { shiftWcs } from "../wcs/cards.js";
import { worldToPixel } from "../wcs/transform.js";

/** A cutout: a {@link SkyMap} plus where it sits in its parent. */
export interface Cutout extends SkyMap {
  /** Parent pixel index of the cutout's pixel (0, 0). */
  x0: number;
  y0: number;
  /** The requested position in the cutout's own 0-based pixel coordinates (fractional). */
  centerIx: number;
  centerIy: number;
  /** True when every cutout pixel lies inside the parent map; pixels outside are NaN. */
  complete: boolean;
}

/** Options of {@link cutout}. */
export interface CutoutOptions {
  /** Throw instead of NaN-filling when the cutout extends past the map edge (default false). */
  requireComplete?: boolean;
}

/**
 * Copy an nxPix × nyPix cutout of `map` centred on the pixel nearest to (raDeg, decDeg): the
 * requested position falls in cutout pixel (floor(nxPix/2), floor(nyPix/2)); its exact fractional
 * position is returned as (centerIx, centerIy). The WCS is the parent's with CRPIX shifted by
 * (−x0, −y0) (Greisen & Calabretta 2002 eq. 3 is unchanged by a shift of origin).
 *
 * @throws UmbraError BAD_WCS when the map has no WCS; BAD_VALUE when the position does not
 *   project or its nearest pixel is off the map, when sizes are not positive integers, or (with
 *   `requireComplete`) when the cutout extends past the map edge.
 */
export function cutout(map: SkyMap, raDeg: number, decDeg: number, nxPix: number, nyPix: number, options: CutoutOptions = {}): Cutout {
  if (map.wcs === null) throw new UmbraError("BAD_WCS", "the map has no celestial WCS: cannot cut around a sky position", { keyword: "CTYPE1" });
  for (const [name, n] of [["nxPix", nxPix], ["nyPix", nyPix]] as const) {
    if (!Number.isInteger(n) || n < 1) throw new UmbraError("BAD_VALUE", `cutout size ${n} is not a positive integer`, { field: name, value: n });
  }
  const p = worldToPixel(map.wcs, raDeg, decDeg);
  const place = { field: "raDeg,decDeg", value: [raDeg, decDeg] };
  if (!Number.isFinite(p.ix) || !Number.isFinite(p.iy)) throw new UmbraError("BAD_VALUE", `position (${raDeg}, ${decDeg}) cannot be projected onto this map`, place);
  const cx = Math.round(p.ix);
  const cy = Math.round(p.iy);
  if (cx < 0 || cy < 0 || cx >= map.nx || cy >= map.ny) {
    throw new UmbraError("BAD_VALUE", `position (${raDeg}, ${decDeg}) is off the map (pixel ${p.ix.toFixed(1)}, ${p.iy.toFixed(1)} of ${map.nx} × ${map.ny})`, place);
  }
  const x0 = cx - Math.floor(nxPix / 2);
  const y0 = cy - Math.floor(nyPix / 2);
  const complete = x0 >= 0 && y0 >= 0 && x0 + nxPix <= map.nx && y0 + nyPix <= map.ny;
  if (!complete && options.requireComplete === true) {
    throw new UmbraError("BAD_VALUE", `a ${nxPix} × ${nyPix} cutout at (${raDeg}, ${decDeg}) extends past the map edge`, place);
  }
  const data = new Float64Array(nxPix * nyPix).fill(NaN);
  const xa = Math.max(0, x0);
  const xb = Math.min(map.nx, x0 + nxPix);
  for (let j = 0; j < nyPix; j++) {
    const y = y0 + j;
    if (y < 0 || y >= map.ny || xb <= xa) continue;
    data.set(map.data.subarray(y * map.nx + xa, y * map.nx + xb), j * nxPix + (xa - x0));
  }
  const out: Cutout = { data, nx: nxPix, ny: nyPix, wcs: shiftWcs(map.wcs, x0, y0), x0, y0, centerIx: p.ix - x0, centerIy: p.iy - y0, complete };
  if (map.unit !== undefined) out.unit = map.unit;
  return out;
}
